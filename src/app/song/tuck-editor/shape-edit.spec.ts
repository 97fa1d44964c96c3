import { tuckShapeSchema, TuckShape } from '../../../../shared/schemas/tuck-shape';
import { defaultShape } from './default-shape';
import { EditHistory } from './edit-history';
import { addPoint, keyStep, movePoint, removePoint, setSegmentCurve } from './shape-edit';

const shape: TuckShape = tuckShapeSchema.parse(defaultShape);
const valid = (s: TuckShape) => tuckShapeSchema.safeParse(s).success;

describe('shape edits', () => {
  it('moves a point but keeps it between its neighbours and at or below 0 dB', () => {
    const moved = movePoint(shape, 1, 500, 12);
    expect(moved.points[1].tMs).toBeCloseTo(shape.points[2].tMs - 0.1, 6);
    expect(moved.points[1].gainDb).toBe(0);
    expect(valid(moved)).toBe(true);
    const early = movePoint(shape, 0, -400, -200);
    expect(early.points[0]).toMatchObject({ tMs: -50, gainDb: -120 });
    expect(shape.points[0].tMs).toBe(-4); // the input is untouched
  });

  it('every random drag keeps the shape valid (times strictly rising)', () => {
    let s = shape;
    let seed = 7;
    const rnd = () => ((seed = (seed * 16807) % 2147483647) / 2147483647);
    for (let k = 0; k < 500; k++) {
      s = movePoint(s, Math.floor(rnd() * s.points.length), rnd() * 300 - 60, -rnd() * 130);
      expect(valid(s)).toBe(true);
    }
  });

  it('adds a point in time order and removes it again, never below two points', () => {
    const { shape: added, index } = addPoint(shape, 20, -10);
    expect(index).toBe(2);
    expect(added.points.map((p) => p.tMs)).toEqual([-4, 0, 20, 40, 140]);
    expect(removePoint(added, index).points).toEqual(shape.points);
    const two = removePoint(removePoint(shape, 1), 1);
    expect(two.points.length).toBe(2);
    expect(removePoint(two, 0).points.length).toBe(2);
    expect(addPoint(shape, 40.05, -3).index).toBe(-1); // too close to an existing point
  });

  it('sets a segment’s curve; the last point has no segment', () => {
    expect(setSegmentCurve(shape, 1, 'smooth').points[1].curve).toBe('smooth');
    expect(setSegmentCurve(shape, 3, 'smooth')).toBe(shape);
  });

  it('steps by 1 or, with Shift, by 0.1', () => {
    expect(keyStep('ArrowRight', false)).toEqual({ dtMs: 1, dDb: 0 });
    expect(keyStep('ArrowDown', true)).toEqual({ dtMs: 0, dDb: -0.1 });
    expect(keyStep('Enter', false)).toBeNull();
  });
});

describe('EditHistory', () => {
  it('undoes and redoes, merging one drag into one step', () => {
    const h = new EditHistory('a');
    h.push('b', 'drag-1');
    h.push('c', 'drag-1');
    h.push('d', 'drag-2');
    expect(h.undo()).toBe('c');
    expect(h.undo()).toBe('a');
    expect(h.canUndo).toBe(false);
    expect(h.redo()).toBe('c');
    h.push('e');
    expect(h.canRedo).toBe(false);
    expect(h.undo()).toBe('c');
  });
});

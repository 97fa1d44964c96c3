import { provideZonelessChangeDetection } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { TuckShape, tuckShapeSchema } from '../../../../shared/schemas/tuck-shape';
import { defaultShape } from './default-shape';
import { ShapeEdit, TuckEditor } from './tuck-editor';

describe('TuckEditor', () => {
  let fixture: ComponentFixture<TuckEditor>;
  let edits: ShapeEdit[];
  const shape: TuckShape = tuckShapeSchema.parse(defaultShape);

  beforeEach(async () => {
    TestBed.configureTestingModule({ imports: [TuckEditor], providers: [provideZonelessChangeDetection()] });
    fixture = TestBed.createComponent(TuckEditor);
    fixture.componentRef.setInput('shape', shape);
    edits = [];
    fixture.componentInstance.edit.subscribe((e) => {
      edits.push(e);
      fixture.componentRef.setInput('shape', e.shape);
    });
    await fixture.whenStable();
  });

  const el = () => fixture.nativeElement as HTMLElement;
  const field = (label: string) =>
    Array.from(el().querySelectorAll('mat-form-field')).find((f) => f.querySelector('mat-label')?.textContent?.trim() === label)!.querySelector('input')!;

  it('draws one focusable breakpoint per point and shows the numbers beside them', () => {
    const points = el().querySelectorAll('circle.point');
    expect(points.length).toBe(4);
    expect(points[1].getAttribute('tabindex')).toBe('0');
    expect(points[1].getAttribute('aria-label')).toBe('Breakpoint 2: 0 ms, −18 dB');
    expect(field('Depth').value).toBe('-18');
    expect(field('Lead-in').value).toBe('4');
    expect(field('Hold').value).toBe('40');
    expect(field('Recovery').value).toBe('100');
  });

  it('moves the selected point with the arrow keys, Shift for the fine step; a held key is one undo step', async () => {
    const point = el().querySelectorAll<SVGCircleElement>('circle.point')[1];
    point.dispatchEvent(new FocusEvent('focus'));
    point.dispatchEvent(new KeyboardEvent('keydown', { key: 'ArrowDown', bubbles: true }));
    point.dispatchEvent(new KeyboardEvent('keydown', { key: 'ArrowDown', shiftKey: true, repeat: true, bubbles: true }));
    point.dispatchEvent(new KeyboardEvent('keydown', { key: 'ArrowRight', bubbles: true }));
    await fixture.whenStable();
    expect(edits.map((e) => e.shape.points[1].gainDb)).toEqual([-19, -19.1, -19.1]);
    expect(edits[2].shape.points[1].tMs).toBe(1);
    expect(edits[0].mergeKey).not.toBeNull();
    expect(edits[1].mergeKey).toBe(edits[0].mergeKey);
    expect(edits[2].mergeKey).not.toBe(edits[1].mergeKey);
    expect(field('Depth').value).toBe('-19.1');
  });

  it('removes the selected point with Delete, keeping at least two', async () => {
    const point = el().querySelectorAll<SVGCircleElement>('circle.point')[2];
    point.dispatchEvent(new FocusEvent('focus'));
    point.dispatchEvent(new KeyboardEvent('keydown', { key: 'Delete', bubbles: true }));
    await fixture.whenStable();
    expect(edits.at(-1)!.shape.points.map((p) => p.tMs)).toEqual([-4, 0, 140]);
  });

  it('typing a depth rescales the drawn shape (the numeric twin)', async () => {
    const depth = field('Depth');
    depth.value = '-24';
    depth.dispatchEvent(new Event('change'));
    await fixture.whenStable();
    expect(edits.at(-1)!.shape.points.map((p) => p.gainDb)).toEqual([0, -24, -24, 0]);
    expect(edits.at(-1)!.mergeKey).toBeNull();
  });
});

import { StoredHitDto } from '../../../../shared/schemas/hit-map';
import { diffHitMaps, hitViews, matchesFilter } from './hit-views';

const h = (id: string, timeSec: number, enabled = true, depthDb: number | null = null): StoredHitDto => ({
  id, position: 0, timeSec, strength: 0.9, enabled, depthDb, origin: 'detected',
});

describe('hit views', () => {
  it('tells the engineer’s off hits from the gate’s skips', () => {
    const views = hitViews([h('a', 0.5), h('b', 1, false), h('c', 1.5)], [2]);
    expect(views.map((v) => v.status)).toEqual(['tucked', 'off', 'gated']);
    expect(views.filter((v) => matchesFilter(v, { kind: 'gated' })).map((v) => v.id)).toEqual(['c']);
    expect(views.filter((v) => matchesFilter(v, { kind: 'weaker', below: 0.95 })).length).toBe(3);
  });

  it('diffs two hit maps into the edit that turns one into the other, and back', () => {
    // The server stores new rows (new ids) on every save: hits match by time.
    const before = [h('a', 0.5), h('b', 1), h('c', 1.5)];
    const after = [h('x', 0.5, false), h('y', 1, true, -6), h('z', 2)];
    expect(diffHitMaps(after, before)).toEqual({
      update: [{ id: 'x', enabled: true }, { id: 'y', depthDb: null }],
      remove: ['z'],
      add: [{ timeSec: 1.5, strength: 0.9 }],
    });
    expect(diffHitMaps(before, before)).toBeNull();
  });
});

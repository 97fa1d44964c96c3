import { Hit } from '../../../../shared/schemas/hit';
import { StoredHitDto } from '../../../../shared/schemas/hit-map';

export type HitStatus = 'tucked' | 'off' | 'gated';

/** One hit as the timeline and the hit table show it. */
export interface HitView {
  index: number;
  id: string;
  number: number;
  timeSec: number;
  strength: number;
  enabled: boolean;
  depthDb: number | null;
  origin: 'detected' | 'added';
  status: HitStatus;
}

/** The engine's input: the stored hits in time order. */
export function toEngineHits(hits: readonly StoredHitDto[]): Hit[] {
  return hits.map((h) => ({ timeSec: h.timeSec, strength: h.strength, enabled: h.enabled, depthDb: h.depthDb ?? null }));
}

/** Joins the stored hits with the stamp's gate result: off (the engineer's), gated (the bass gate's) or tucked. */
export function hitViews(hits: readonly StoredHitDto[], gatedIndexes: readonly number[]): HitView[] {
  const gated = new Set(gatedIndexes);
  return hits.map((h, index) => ({
    index,
    id: h.id,
    number: index + 1,
    timeSec: h.timeSec,
    strength: h.strength,
    enabled: h.enabled,
    depthDb: h.depthDb ?? null,
    origin: h.origin,
    status: !h.enabled ? 'off' : gated.has(index) ? 'gated' : 'tucked',
  }));
}

export type HitFilter = { kind: 'all' } | { kind: 'on' } | { kind: 'off' } | { kind: 'gated' } | { kind: 'weaker'; below: number };

export function matchesFilter(hit: HitView, f: HitFilter): boolean {
  switch (f.kind) {
    case 'all': return true;
    case 'on': return hit.enabled;
    case 'off': return !hit.enabled;
    case 'gated': return hit.status === 'gated';
    case 'weaker': return hit.strength < f.below;
  }
}

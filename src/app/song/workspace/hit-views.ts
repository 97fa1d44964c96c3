import { Hit } from '../../../../shared/schemas/hit';
import { HitEdit, StoredHitDto } from '../../../../shared/schemas/hit-map';

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

/**
 * The edit that turns hit map `from` into `to` (for undo and redo of hit edits).
 * Hits are matched by time (to the microsecond), not id: the server stores a
 * fresh set of hit rows on every save. Changed on/off and depths become updates
 * of `from`'s ids, hits only in `from` are removed, hits only in `to` added.
 */
export function diffHitMaps(from: readonly StoredHitDto[], to: readonly StoredHitDto[]): HitEdit | null {
  const key = (h: StoredHitDto) => Math.round(h.timeSec * 1e6);
  const target = new Map(to.map((h) => [key(h), h]));
  const update: NonNullable<HitEdit['update']> = [];
  const remove: string[] = [];
  for (const h of from) {
    const t = target.get(key(h));
    if (!t) {
      remove.push(h.id);
      continue;
    }
    const change: NonNullable<HitEdit['update']>[number] = { id: h.id };
    if (t.enabled !== h.enabled) change.enabled = t.enabled;
    if ((t.depthDb ?? null) !== (h.depthDb ?? null)) change.depthDb = t.depthDb ?? null;
    if (change.enabled !== undefined || change.depthDb !== undefined) update.push(change);
  }
  const known = new Set(from.map(key));
  const add = to.filter((h) => !known.has(key(h))).map((h) => ({ timeSec: h.timeSec, strength: h.strength }));
  if (!update.length && !remove.length && !add.length) return null;
  return { ...(update.length ? { update } : {}), ...(remove.length ? { remove } : {}), ...(add.length ? { add } : {}) };
}

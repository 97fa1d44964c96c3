import type { Hit } from '../../shared/schemas/hit';

export interface StoredHit extends Hit {
  origin: 'detected' | 'added';
}

export interface RevisionSummary {
  /** Hit times (s) found now that had no counterpart before. */
  added: number[];
  /** Hit times (s) that were detected before and are gone now. */
  removed: number[];
  /** Hits found again, but moved by more than `movedAboveMs`: [before, after] in s. */
  moved: [number, number][];
  /** How many engineer edits (off, per-hit depth, added by hand) were carried over. */
  editsCarried: number;
  toleranceMs: number;
}

/**
 * Carries the engineer's edits from the previous hit map onto a new detection:
 * each new hit takes the edits of the previous hit nearest to it within the
 * tolerance (matched one to one, nearest pairs first); hits added by hand stay
 * unless detection now finds them too. Returns the new hits and what changed.
 */
export function carryOverEdits(previous: StoredHit[], detected: Hit[], toleranceMs = 10, movedAboveMs = 1): { hits: StoredHit[]; summary: RevisionSummary } {
  const tol = toleranceMs / 1000;
  const pairs: { p: number; d: number; dt: number }[] = [];
  // Both lists are sorted by time, so a moving window finds the candidate pairs in linear time.
  let start = 0;
  for (let d = 0; d < detected.length; d++) {
    const t = detected[d].timeSec;
    while (start < previous.length && previous[start].timeSec < t - tol) start++;
    for (let p = start; p < previous.length && previous[p].timeSec <= t + tol; p++) {
      pairs.push({ p, d, dt: Math.abs(previous[p].timeSec - t) });
    }
  }
  pairs.sort((a, b) => a.dt - b.dt);
  const prevTaken = new Int32Array(previous.length).fill(-1);
  const detTaken = new Int32Array(detected.length).fill(-1);
  for (const pair of pairs) {
    if (prevTaken[pair.p] >= 0 || detTaken[pair.d] >= 0) continue;
    prevTaken[pair.p] = pair.d;
    detTaken[pair.d] = pair.p;
  }

  const summary: RevisionSummary = { added: [], removed: [], moved: [], editsCarried: 0, toleranceMs };
  const hits: StoredHit[] = detected.map((hit, d) => {
    const p = detTaken[d];
    if (p < 0) {
      if (previous.length) summary.added.push(hit.timeSec);
      return { ...hit, enabled: true, depthDb: null, origin: 'detected' };
    }
    const before = previous[p];
    if (Math.abs(before.timeSec - hit.timeSec) * 1000 > movedAboveMs) summary.moved.push([before.timeSec, hit.timeSec]);
    const edited = !before.enabled || before.depthDb != null || before.origin === 'added';
    if (edited) summary.editsCarried++;
    return { ...hit, enabled: before.enabled, depthDb: before.depthDb ?? null, origin: 'detected' };
  });
  previous.forEach((before, p) => {
    if (prevTaken[p] >= 0) return;
    if (before.origin === 'added') {
      hits.push({ ...before });
      summary.editsCarried++;
    } else {
      summary.removed.push(before.timeSec);
    }
  });
  hits.sort((a, b) => a.timeSec - b.timeSec);
  return { hits, summary };
}

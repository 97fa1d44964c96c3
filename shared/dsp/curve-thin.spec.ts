import { describe, expect, it } from 'vitest';
import type { Hit } from '../schemas/hit';
import { tuckShapeSchema } from '../schemas/tuck-shape';
import type { GainCurve } from './gain-curve';
import { gainDbAt } from './gain';
import { thinCurve } from './curve-thin';
import { stampHits } from './stamp';
import { mulberry32 as rng } from './prng';

/** The thinned curve read with straight lines in amplitude, as some DAWs do, dB. */
function ampInterpDb(curve: GainCurve, t: number): number {
  const p = curve.points;
  let k = 0;
  while (k + 1 < p.length && p[k + 1].timeSec < t) k++;
  const a = p[k];
  const b = p[Math.min(k + 1, p.length - 1)];
  const u = b.timeSec > a.timeSec ? Math.min(1, Math.max(0, (t - a.timeSec) / (b.timeSec - a.timeSec))) : 1;
  const amp = Math.pow(10, a.gainDb / 20) + (Math.pow(10, b.gainDb / 20) - Math.pow(10, a.gainDb / 20)) * u;
  return 20 * Math.log10(amp);
}

describe('thinCurve', () => {
  it('stays within 0.5 dB of the true curve above −40 dB, read straight in dB and in amplitude (property, random shapes and hits; requirement 3)', () => {
    const r = rng(3);
    let worstDb = 0;
    let worstAmp = 0;
    let kept = 0;
    let total = 0;
    for (let k = 0; k < 60; k++) {
      const n = 2 + Math.floor(r() * 6);
      const times = new Set<number>([-(r() * 20), 1 + r() * 200]);
      while (times.size < n) times.add(Math.round((-20 + r() * 300) * 10) / 10);
      const points = [...times].sort((a, b) => a - b).map((tMs) => ({ tMs, gainDb: -r() * 60, curve: r() < 0.5 ? ('linear' as const) : ('smooth' as const) }));
      const shape = tuckShapeSchema.parse({ points, slopeGuardMs: 1 + r() * 10 });
      const hits: Hit[] = [];
      for (let t = 0.05; t < 3; t += 0.03 + r() * 0.4) hits.push({ timeSec: t, strength: 1, enabled: true, depthDb: r() < 0.3 ? -r() * 40 : null });
      const truth = stampHits(hits, shape, { durationSec: 3, baseGainDb: -6 + r() * 12 }).curve;
      const thin = thinCurve(truth);
      kept += thin.points.length;
      total += truth.points.length;
      const check = (t: number) => {
        const g = gainDbAt(truth, t);
        if (g < -40) return;
        worstDb = Math.max(worstDb, Math.abs(gainDbAt(thin, t) - g));
        worstAmp = Math.max(worstAmp, Math.abs(ampInterpDb(thin, t) - g));
      };
      const p = truth.points;
      for (let i = 0; i < p.length; i++) {
        check(p[i].timeSec);
        if (i + 1 < p.length) check((p[i].timeSec + p[i + 1].timeSec) / 2);
      }
    }
    expect(worstDb).toBeLessThanOrEqual(0.5);
    expect(worstAmp).toBeLessThanOrEqual(0.5);
    // And it does thin: well under half the points are kept.
    expect(kept / total).toBeLessThan(0.5);
  });

  it('keeps the ends and flat runs exact', () => {
    const curve: GainCurve = { points: [{ timeSec: 0, gainDb: 0 }, { timeSec: 1, gainDb: 0 }, { timeSec: 2, gainDb: 0 }, { timeSec: 2.01, gainDb: -20 }, { timeSec: 3, gainDb: -20 }] };
    const thin = thinCurve(curve).points;
    expect(thin[0]).toEqual({ timeSec: 0, gainDb: 0 });
    expect(thin[thin.length - 1]).toEqual({ timeSec: 3, gainDb: -20 });
    expect(thin).toContainEqual({ timeSec: 2, gainDb: 0 });
    expect(thin).toContainEqual({ timeSec: 2.01, gainDb: -20 });
    expect(thin).not.toContainEqual({ timeSec: 1, gainDb: 0 });
    // A 20 dB step read straight in amplitude needs points inside it (0.5 dB rule).
    expect(thin.length).toBeGreaterThan(4);
  });

  it('gives the same result whatever it thinned before (its working arrays are reused from call to call)', () => {
    const shape = tuckShapeSchema.parse({ points: [{ tMs: -3, gainDb: 0 }, { tMs: 0, gainDb: -40 }, { tMs: 50, gainDb: -40 }, { tMs: 150, gainDb: 0 }] });
    const stamp = (count: number, spacingSec: number) => {
      const hits: Hit[] = Array.from({ length: count }, (_, i) => ({ timeSec: 0.1 + i * spacingSec, strength: 1, enabled: true }));
      return stampHits(hits, shape, { durationSec: 0.2 + count * spacingSec, baseGainDb: -2 }).curve;
    };
    const small = stamp(5, 0.3);
    const first = thinCurve(small).points;
    thinCurve(stamp(400, 0.17));
    expect(thinCurve(small).points).toEqual(first);
    expect(first.length).toBeGreaterThan(10);
  });
});

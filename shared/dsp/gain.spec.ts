import { describe, expect, it } from 'vitest';
import { applyGainCurve, dbToGain, gainDbAt, gainToDb, sampleGainCurve } from './gain';
import type { GainCurve } from './gain-curve';

const curve: GainCurve = { points: [{ timeSec: 0, gainDb: 0 }, { timeSec: 0.01, gainDb: 0 }, { timeSec: 0.02, gainDb: -40 }, { timeSec: 0.05, gainDb: -40 }, { timeSec: 0.1, gainDb: -6 }] };

describe('gain', () => {
  it('dB and amplitude convert both ways: −6.0206 dB ↔ 0.5, −20 dB ↔ 0.1 (definition of the decibel)', () => {
    expect(dbToGain(-20)).toBeCloseTo(0.1, 15);
    expect(gainToDb(0.5)).toBeCloseTo(-6.0206, 4);
    expect(gainToDb(0)).toBe(-Infinity);
    for (const db of [-120, -60, -3.3, 0, 6]) expect(gainToDb(dbToGain(db))).toBeCloseTo(db, 10);
  });

  it('samples the curve per sample as 10^(g/20), g straight in dB between breakpoints (known by construction)', () => {
    const fs = 48_000;
    const frames = 6000;
    const g = sampleGainCurve(curve, frames, fs);
    for (let n = 0; n < frames; n += 7) expect(g[n]).toBeCloseTo(dbToGain(gainDbAt(curve, n / fs)), 5);
    // Block-wise sampling equals sampling at once.
    const block = sampleGainCurve(curve, 1000, fs, undefined, 700);
    for (let n = 0; n < 1000; n++) expect(block[n]).toBeCloseTo(g[700 + n], 6);
  });

  it('applies the curve to every channel', () => {
    const x = [new Float32Array(4800).fill(0.5), new Float32Array(4800).fill(-1)];
    const y = applyGainCurve(x, 48_000, curve);
    expect(y[0][1440]).toBeCloseTo(0.5 * dbToGain(-40), 6);
    expect(y[1][1440]).toBeCloseTo(-dbToGain(-40), 6);
    expect(x[0][1440]).toBe(0.5);
  });
});

import { describe, expect, it } from 'vitest';
import { kWeightingFilters } from './k-weighting';
import { measureLoudness, samplePeakDbfs } from './loudness';
import { truePeakDbtp } from './true-peak';

const fs = 48_000;
/** A 1 kHz sine per EBU Tech 3341's cases: `dbfs` per channel, both channels in phase. */
function tone(segments: [seconds: number, dbfs: number][], hz = 1000): Float32Array[] {
  const total = segments.reduce((n, [s]) => n + Math.round(s * fs), 0);
  const x = new Float32Array(total);
  let at = 0;
  for (const [s, db] of segments) {
    const a = 10 ** (db / 20);
    const n = Math.round(s * fs);
    for (let i = 0; i < n; i++) x[at + i] = a * Math.sin((2 * Math.PI * hz * (at + i)) / fs);
    at += n;
  }
  return [x, x.slice()];
}

describe('K-weighting (ITU-R BS.1770-4 §2.1)', () => {
  it('gives the standard\'s 48 kHz coefficients', () => {
    const [shelf, hp] = kWeightingFilters(48_000);
    // BS.1770-4 Table 1 and Table 2.
    expect(shelf.b0).toBeCloseTo(1.53512485958697, 8);
    expect(shelf.b1).toBeCloseTo(-2.69169618940638, 8);
    expect(shelf.b2).toBeCloseTo(1.19839281085285, 8);
    expect(shelf.a1).toBeCloseTo(-1.69065929318241, 8);
    expect(shelf.a2).toBeCloseTo(0.73248077421585, 8);
    expect(hp.a1).toBeCloseTo(-1.99004745483398, 8);
    expect(hp.a2).toBeCloseTo(0.99007225036621, 8);
  });

  it('reads a 0 dBFS 997 Hz mono sine as −3.01 LUFS (BS.1770-4: +0.691 dB filter gain at 997 Hz)', () => {
    const [x] = tone([[10, 0]], 997);
    expect(measureLoudness([x], fs).integratedLufs).toBeCloseTo(-3.01, 1);
  });
});

describe('EBU Tech 3341 cases (tolerance ±0.1 LU)', () => {
  it.each([
    ['20 s at −23 dBFS', [[20, -23]], -23],
    ['20 s at −33 dBFS', [[20, -33]], -33],
    ['10 s −36 / 60 s −23 / 10 s −36', [[10, -36], [60, -23], [10, -36]], -23],
    ['−72/−36/−23/−36/−72 for 10/10/60/10/10 s', [[10, -72], [10, -36], [60, -23], [10, -36], [10, -72]], -23],
    ['20 s −26 / 20.1 s −20 / 20 s −26', [[20, -26], [20.1, -20], [20, -26]], -23],
  ] as [string, [number, number][], number][])('%s → I = %d LUFS', (_name, segments, expected) => {
    expect(Math.abs(measureLoudness(tone(segments), fs).integratedLufs - expected)).toBeLessThanOrEqual(0.1);
  });

  it('reads short-term loudness of a steady tone as its integrated loudness', () => {
    const r = measureLoudness(tone([[10, -23]]), fs);
    expect(r.maxShortTermLufs).toBeCloseTo(-23, 1);
  });

  it('gates out silence entirely (−Infinity), never a number', () => {
    expect(measureLoudness([new Float32Array(fs * 5)], fs).integratedLufs).toBe(-Infinity);
  });
});

describe('true peak (BS.1770-4 Annex 2) on the EBU Tech 3341 cases (+0.2/−0.4 dB)', () => {
  /** A tone at fs/4 with the given amplitude and start phase, one channel, 1 s. */
  function quarter(amplitude: number, phaseDeg: number) {
    const x = new Float32Array(fs);
    for (let i = 0; i < x.length; i++) x[i] = amplitude * Math.sin((Math.PI / 2) * i + (phaseDeg * Math.PI) / 180);
    return [x];
  }
  const within = (measured: number, expected: number) => {
    expect(measured).toBeLessThanOrEqual(expected + 0.2);
    expect(measured).toBeGreaterThanOrEqual(expected - 0.4);
  };

  it('fs/4 at 0.5 of full scale, phase 0° → −6.0 dBTP', () => within(truePeakDbtp(quarter(0.5, 0)), -6.0));
  it('fs/4 at 0.5, phase 45° → −6.0 dBTP while the sample peak reads −9.0 dBFS', () => {
    const x = quarter(0.5, 45);
    within(truePeakDbtp(x), -6.0);
    expect(samplePeakDbfs(x)).toBeCloseTo(-9.03, 1);
  });
  it('fs/4 at 1.41 of full scale, phase 45° → +3.0 dBTP', () => within(truePeakDbtp(quarter(1.41, 45)), 3.0));
});

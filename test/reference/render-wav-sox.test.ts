/**
 * Requirement 6: the rendered stem is the bass × the gain curve, sample by
 * sample, in the input's format. Inputs are made by sox (an independent
 * writer, which uses WAVE_FORMAT_EXTENSIBLE for some of them); outputs are
 * read back by sox as raw 32-bit float (an independent reader) and described
 * by `sox --i` and `sox -n stat`.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { RENDER_RAMP_TOLERANCE_DB, renderWavFile, stampForLane } from '../../server/engine/engine.service';
import { gainDbAt } from '../../shared/dsp/gain';

const dir = mkdtempSync(join(tmpdir(), 'tuckline-render-'));
const sox = (...args: string[]) => execFileSync('sox', args, { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] });
/** `sox --i` fields. */
function soxInfo(path: string): Record<string, string> {
  const out: Record<string, string> = {};
  for (const line of sox('--i', path).split('\n')) {
    const m = line.match(/^([^:]+?)\s*:\s*(.*)$/);
    if (m) out[m[1]] = m[2];
  }
  return out;
}
/** Samples as sox decodes them (interleaved, full scale ±1). */
function soxSamples(path: string): Float32Array {
  const buf = execFileSync('sox', [path, '-t', 'f32', '-e', 'floating-point', '-b', '32', '-'], { maxBuffer: 1 << 28 });
  return new Float32Array(buf.buffer, buf.byteOffset, buf.byteLength / 4);
}

const shape = { points: [{ tMs: -3, gainDb: 0 }, { tMs: 0, gainDb: -40 }, { tMs: 50, gainDb: -40 }, { tMs: 150, gainDb: 0 }], slopeGuardMs: 5 };
const hits = [0.5, 1.5].map((timeSec) => ({ timeSec, strength: 1, enabled: true }));
const SR = 48000;
const DURATION = 2.3;
const { curve } = stampForLane(hits, { shape, baseGainDb: -3 }, { durationSec: DURATION, rampToleranceDb: RENDER_RAMP_TOLERANCE_DB });

const formats = [
  { name: '16-bit int stereo', args: ['-b', '16', '-e', 'signed-integer', '-c', '2'], precision: '16-bit', encoding: /16-bit Signed Integer PCM/, lsb: 1 / 32768 },
  { name: '24-bit int mono', args: ['-b', '24', '-e', 'signed-integer', '-c', '1'], precision: '24-bit', encoding: /24-bit Signed Integer PCM/, lsb: 1 / 8388608 },
  { name: '32-bit float stereo', args: ['-b', '32', '-e', 'floating-point', '-c', '2'], precision: '25-bit', encoding: /32-bit Floating Point PCM/, lsb: 1e-7 },
  { name: '8-bit unsigned mono', args: ['-b', '8', '-e', 'unsigned-integer', '-c', '1'], precision: '8-bit', encoding: /8-bit Unsigned Integer PCM/, lsb: 1 / 128 },
];

describe('rendered WAV: bass × gain curve, same format (checked with sox)', () => {
  for (const f of formats) {
    it(`${f.name}: same rate, channels, length and coding; every sample = input × 10^(g/20)`, async () => {
      const input = join(dir, `in-${f.args.join('')}.wav`);
      const output = join(dir, `out-${f.args.join('')}.wav`);
      // A 55 Hz sine at −1 dBFS plus a little 3 kHz so channels differ in stereo.
      sox('-n', '-r', String(SR), ...f.args, input, 'synth', String(DURATION), 'sine', '55', 'sine', '3000', 'remix', '-', 'gain', '-1', 'channels', f.args[f.args.length - 1]);
      await renderWavFile(input, curve, output);

      const a = soxInfo(input);
      const b = soxInfo(output);
      for (const k of ['Channels', 'Sample Rate', 'Precision', 'Duration', 'Sample Encoding']) expect(b[k]).toBe(a[k]);
      expect(b['Precision']).toBe(f.precision);
      expect(b['Sample Encoding']).toMatch(f.encoding);
      const stat = spawnSync('sox', [output, '-n', 'stat'], { encoding: 'utf8' });
      expect(stat.status).toBe(0);
      expect(stat.stderr).toMatch(new RegExp(`Samples read:\\s+${Math.round(DURATION * SR) * Number(a['Channels'])}\\b`));
      expect(stat.stderr).toMatch(/Length \(seconds\):\s+2\.300000/);

      const x = soxSamples(input);
      const y = soxSamples(output);
      expect(y.length).toBe(x.length);
      const ch = Number(a['Channels']);
      const frames = x.length / ch;
      expect(frames).toBe(Math.round(DURATION * SR));
      let worst = 0;
      for (let n = 0; n < frames; n++) {
        const g = Math.pow(10, gainDbAt(curve, n / SR) / 20);
        for (let c = 0; c < ch; c++) worst = Math.max(worst, Math.abs(y[n * ch + c] - x[n * ch + c] * g));
      }
      // One LSB of rounding, plus sox's and wav-decoder's different integer scales (2^(b−1) vs 2^(b−1)−1).
      expect(worst).toBeLessThanOrEqual(1.5 * f.lsb + 1e-6);
      // Known points: mid-hold the gain is −43 dB, far from a tuck it is −3 dB (the base gain).
      const ratioAt = (t: number) => {
        let num = 0;
        let den = 0;
        const n0 = Math.round(t * SR);
        for (let n = n0 - 240; n < n0 + 240; n++) for (let c = 0; c < ch; c++) {
          num += y[n * ch + c] * x[n * ch + c];
          den += x[n * ch + c] * x[n * ch + c];
        }
        return 20 * Math.log10(num / den);
      };
      if (f.lsb < 1e-3) expect(ratioAt(0.525)).toBeCloseTo(-43, 1);
      expect(ratioAt(1.0)).toBeCloseTo(-3, 1);
    });
  }
});

import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { levelFigures, sumStems } from '../../shared/dsp/headroom';
import { encodeWav } from '../../shared/formats/wav-write';
import { renderDemoStems } from '../../server/seed/demo-stems';
import { readWavFile } from '../../server/audio/wav-file';

// The independent reference: Debian's ffmpeg, `-af ebur128=peak=true` (REFERENCES.md "Reference tool").
if (!existsSync('/usr/bin/ffmpeg')) throw new Error('ffmpeg is missing: apt-get install -y ffmpeg');

const dir = mkdtempSync(join(tmpdir(), 'tuckline-loudness-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function ffmpegEbur128(path: string): { integratedLufs: number; truePeakDbtp: number } {
  // ffmpeg prints the meter's summary on stderr.
  const run = spawnSync('ffmpeg', ['-nostats', '-hide_banner', '-i', path, '-af', 'ebur128=peak=true', '-f', 'null', '-'], { encoding: 'utf8' });
  if (run.status !== 0) throw new Error(`ffmpeg failed: ${run.stderr}`);
  return parse(run.stderr);
}

function parse(text: string) {
  const summary = text.slice(text.lastIndexOf('Summary:'));
  const integrated = Number(/I:\s+(-?[\d.]+|-inf)\s+LUFS/.exec(summary)?.[1]);
  // ffmpeg labels the true peak "dBFS" in its summary (REFERENCES.md).
  const peak = Number(/True peak:\s+Peak:\s+(-?[\d.]+|-inf)\s+dBFS/.exec(summary)?.[1]);
  return { integratedLufs: integrated, truePeakDbtp: peak };
}

function write(name: string, channels: Float32Array[], sampleRate: number): string {
  const path = join(dir, name);
  writeFileSync(path, encodeWav(channels, { sampleRate, bitDepth: 32, sampleFormat: 'float' }));
  return path;
}

function noiseBursts(sampleRate: number, seconds: number): Float32Array[] {
  let seed = 12345;
  const rand = () => ((seed = (seed * 1103515245 + 12345) >>> 0) / 4294967296) * 2 - 1;
  const n = Math.round(sampleRate * seconds);
  const l = new Float32Array(n);
  const r = new Float32Array(n);
  for (let i = 0; i < n; i++) {
    const env = Math.floor(i / (sampleRate * 0.5)) % 2 === 0 ? 0.3 : 0.03;
    l[i] = env * rand();
    r[i] = env * rand();
  }
  return [l, r];
}

describe('loudness and true peak against ffmpeg ebur128 (I within 0.1 LU, true peak within 0.3 dB)', () => {
  const stems = renderDemoStems({ bpm: 140, bars: 8 });

  const cases: [string, () => { channels: Float32Array[]; sampleRate: number }][] = [
    ['EBU-style 1 kHz tone at −23 dBFS, stereo, 48 kHz', () => {
      const n = 48000 * 10;
      const x = new Float32Array(n);
      for (let i = 0; i < n; i++) x[i] = 10 ** (-23 / 20) * Math.sin((2 * Math.PI * 1000 * i) / 48000);
      return { channels: [x, x.slice()], sampleRate: 48000 };
    }],
    ['noise bursts, stereo, 44.1 kHz', () => ({ channels: noiseBursts(44100, 12), sampleRate: 44100 })],
    ['synthetic kick plus 808 (the demo generator), 48 kHz', () => ({ channels: [], sampleRate: 48000 })],
  ];

  it.each(cases)('%s', async (name, make) => {
    let { channels, sampleRate } = make();
    if (!channels.length) {
      const kick = join(dir, 'demo-kick.wav');
      const bass = join(dir, 'demo-bass.wav');
      writeFileSync(kick, stems.kickWav);
      writeFileSync(bass, stems.bassWav);
      channels = sumStems([(await readWavFile(kick)).channels, (await readWavFile(bass)).channels]);
    }
    const path = write(`${name.replace(/\W+/g, '-')}.wav`, channels, sampleRate);
    const ours = levelFigures(channels, sampleRate);
    const ref = ffmpegEbur128(path);
    expect(Number.isFinite(ref.integratedLufs)).toBe(true);
    expect(Math.abs(ours.integratedLufs - ref.integratedLufs)).toBeLessThanOrEqual(0.1);
    expect(Math.abs(ours.truePeakDbtp - ref.truePeakDbtp)).toBeLessThanOrEqual(0.3);
  });
});

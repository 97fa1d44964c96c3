import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { probeAudioFile } from '../../server/audio/audio-info';
import { readWavFile, readWavMono } from '../../server/audio/wav-file';
import { bassActivityFromFile } from '../../server/audio/bass-activity';
import { detectKickFile } from '../../server/audio/kick-detection';
import { AudioInputError } from '../../server/audio/audio-errors';
import { encodeWav, type WavEncoding } from './fixtures/wav-encode';
import { FIXTURE_DIR } from './fixtures/kick-scene';
import { mulberry32 } from './fixtures/prng';

const dir = join(FIXTURE_DIR, 'wav-read');
mkdirSync(dir, { recursive: true });

function write(name: string, bytes: Uint8Array): string {
  const path = join(dir, name);
  writeFileSync(path, bytes);
  return path;
}

/** A deterministic test signal per channel: a sine per channel plus seeded noise, within ±0.9. */
function signal(channels: number, frames: number, sampleRateHz: number): Float32Array[] {
  const rnd = mulberry32(42);
  return Array.from({ length: channels }, (_, c) =>
    Float32Array.from({ length: frames }, (_, i) => 0.6 * Math.sin((2 * Math.PI * (220 + 110 * c) * i) / sampleRateHz) + 0.3 * (2 * rnd() - 1)),
  );
}

/** The value a b-bit integer WAV stores for x (our encoder rounds to (2^(b−1)−1)·x) read back the way wav-decoder scales. */
function quantised(x: number, bits: number): number {
  const max = 2 ** (bits - 1) - 1;
  const q = Math.round(Math.max(-1, Math.min(1, x)) * max);
  return q < 0 ? q / (max + 1) : q / max;
}

async function expectInputError(run: Promise<unknown>, code: string, status: number): Promise<void> {
  const error = await run.then(
    () => null,
    (e: unknown) => e,
  );
  expect(error, `expected ${code}`).toBeInstanceOf(AudioInputError);
  const e = error as AudioInputError;
  expect({ code: e.code, status: e.status }).toEqual({ code, status });
  // One line, for the engineer who uploaded the file.
  expect(e.message).not.toMatch(/\n/);
  expect(e.message.length).toBeGreaterThan(10);
}

const VARIANTS: Array<{ name: string; rate: number; channels: number; enc: WavEncoding }> = [
  { name: 'int8-mono-44k', rate: 44100, channels: 1, enc: { bits: 8 } },
  { name: 'int16-mono-44k', rate: 44100, channels: 1, enc: { bits: 16 } },
  { name: 'int16-stereo-48k', rate: 48000, channels: 2, enc: { bits: 16 } },
  { name: 'int24-stereo-96k', rate: 96000, channels: 2, enc: { bits: 24 } },
  { name: 'int32-6ch-48k', rate: 48000, channels: 6, enc: { bits: 32 } },
  { name: 'f32-stereo-192k', rate: 192000, channels: 2, enc: { bits: 32, float: true } },
  { name: 'f64-mono-88k', rate: 88200, channels: 1, enc: { bits: 64, float: true } },
  { name: 'ext-int16-stereo-44k', rate: 44100, channels: 2, enc: { bits: 16, extensible: true } },
  { name: 'ext-int24-stereo-48k', rate: 48000, channels: 2, enc: { bits: 24, extensible: true } },
  { name: 'ext-int32-4ch-96k', rate: 96000, channels: 4, enc: { bits: 32, extensible: true } },
  { name: 'ext-f32-stereo-48k', rate: 48000, channels: 2, enc: { bits: 32, float: true, extensible: true } },
  { name: 'ext-f64-mono-192k', rate: 192000, channels: 1, enc: { bits: 64, float: true, extensible: true } },
];

describe('WAV reading: every PCM and float variant, plain and extensible', () => {
  for (const v of VARIANTS) {
    it(`${v.name}: header, samples and mono mixdown (known by construction)`, async () => {
      // 1.3 s spans more than one 1 MiB block for the wide formats, so block joins are exercised.
      const frames = Math.round(1.3 * v.rate) + 1;
      const channels = signal(v.channels, frames, v.rate);
      const path = write(`${v.name}.wav`, encodeWav(channels, v.rate, v.enc));
      const info = await probeAudioFile(path);
      expect(info).toEqual({
        format: 'wav',
        sampleRate: v.rate,
        bitDepth: v.enc.bits,
        sampleFormat: v.enc.float ? 'float' : 'int',
        channels: v.channels,
        frames,
        durationSec: frames / v.rate,
      });
      const whole = await readWavFile(path);
      expect(whole.channels).toHaveLength(v.channels);
      // Integers: the quantised value exactly (float32 rounding aside); floats: the value.
      const tolerance = v.enc.float ? (v.enc.bits === 32 ? 0 : 1e-7) : 1e-7;
      for (let c = 0; c < v.channels; c++) {
        for (const i of [0, 1, 12345, frames >> 1, frames - 1]) {
          const expected = v.enc.float ? Math.fround(channels[c]![i]!) : quantised(channels[c]![i]!, v.enc.bits);
          expect(Math.abs(whole.channels[c]![i]! - expected)).toBeLessThanOrEqual(tolerance + Math.abs(expected) * 1.2e-7);
        }
      }
      // The direct mono path agrees with wav-decoder + mixdown sample for sample (our own path check).
      const direct = await readWavMono(path);
      const viaDecoder = await readWavMono(path, { decoder: 'wav-decoder' });
      expect(direct.mono.length).toBe(frames);
      let maxDiff = 0;
      for (let i = 0; i < frames; i++) maxDiff = Math.max(maxDiff, Math.abs(direct.mono[i]! - viaDecoder.mono[i]!));
      expect(maxDiff).toBeLessThanOrEqual(2.4e-7);
      const i = frames >> 2;
      const mean = whole.channels.reduce((s, ch) => s + ch[i]!, 0) / v.channels;
      expect(direct.mono[i]).toBeCloseTo(mean, 6);
    });
  }

  it('reads files written by sox, an independent encoder (sox writes extensible for 24-bit stereo)', async () => {
    const path = join(dir, 'sox-24-stereo.wav');
    execFileSync('sox', ['-n', '-r', '48000', '-b', '24', '-c', '2', path, 'synth', '0.5', 'sine', '1000', 'gain', '-6']);
    const info = await probeAudioFile(path);
    expect(info).toMatchObject({ sampleRate: 48000, bitDepth: 24, channels: 2, sampleFormat: 'int', frames: 24000 });
    // sox's own float rendering of the same file, as raw little-endian float32.
    const raw = execFileSync('sox', [path, '-t', 'f32', '-e', 'floating-point', '-']);
    const ref = new Float32Array(raw.buffer, raw.byteOffset, raw.byteLength / 4);
    const { channels } = await readWavFile(path);
    let maxDiff = 0;
    for (let i = 0; i < 24000; i++) for (let c = 0; c < 2; c++) maxDiff = Math.max(maxDiff, Math.abs(channels[c]![i]! - ref[2 * i + c]!));
    // One 24-bit step (2^−23): sox and wav-decoder differ only in how positive values are scaled.
    expect(maxDiff).toBeLessThan(2 ** -22);
  });

  it('readWavMono with lowpassHz keeps a 50 Hz tone and drops a 2 kHz one (4th-order Butterworth at 150 Hz; known by construction)', async () => {
    const fs = 48000;
    const low = Float32Array.from({ length: fs }, (_, i) => 0.4 * Math.sin((2 * Math.PI * 50 * i) / fs));
    const high = Float32Array.from({ length: fs }, (_, i) => 0.4 * Math.sin((2 * Math.PI * 2000 * i) / fs));
    const rms = (x: Float32Array): number => Math.sqrt(x.subarray(fs / 2).reduce((s, v) => s + v * v, 0) / (fs / 2));
    const a = await readWavMono(write('lp-50.wav', encodeWav([low], fs, { bits: 32, float: true })), { lowpassHz: 150 });
    const b = await readWavMono(write('lp-2k.wav', encodeWav([high], fs, { bits: 32, float: true })), { lowpassHz: 150 });
    expect(20 * Math.log10(rms(a.mono) / rms(low))).toBeGreaterThan(-0.1);
    // |H| of an analogue 4th-order Butterworth at 2000/150: 10·log10(1 + 13.3^8) ≈ 90 dB; the bilinear digital one is at least that.
    expect(20 * Math.log10(rms(b.mono) / rms(high))).toBeLessThan(-80);
  });

  it('walks past other chunks, odd-sized ones padded to even length (RIFF 1991)', async () => {
    const channels = signal(2, 4800, 48000);
    const bytes = encodeWav(channels, 48000, { bits: 16, extraChunks: [{ id: 'LIST', body: new Uint8Array(33).fill(65) }, { id: 'bext', body: new Uint8Array(602) }] });
    const path = write('extra-chunks.wav', bytes);
    const { info, channels: read } = await readWavFile(path);
    expect(info.frames).toBe(4800);
    expect(read[1]![100]).toBeCloseTo(quantised(channels[1]![100]!, 16), 6);
  });
});

describe('WAV reading: bad input gives one clear error (AudioInputError), never a crash', () => {
  const good = (): Uint8Array => encodeWav(signal(2, 48000, 48000), 48000, { bits: 24 });

  it('zero bytes → audio.empty, 400', async () => {
    await expectInputError(probeAudioFile(write('empty.wav', new Uint8Array(0))), 'audio.empty', 400);
  });
  it('text, not RIFF/WAVE → audio.not_wav, 415', async () => {
    await expectInputError(probeAudioFile(write('text.wav', new TextEncoder().encode('hello, this is not audio at all'))), 'audio.not_wav', 415);
  });
  it('RIFF but not WAVE (an AVI) → audio.not_wav, 415', async () => {
    const b = good();
    b.set(new TextEncoder().encode('AVI '), 8);
    await expectInputError(probeAudioFile(write('avi.wav', b)), 'audio.not_wav', 415);
  });
  it('MP3 bytes (ID3 tag, frame sync) → audio.unsupported_codec, 415', async () => {
    await expectInputError(probeAudioFile(write('song.mp3.wav', Uint8Array.from([0x49, 0x44, 0x33, 3, 0, 0, 0, 0, 0, 10, 0xff, 0xfb, 0x90, 0x64]))), 'audio.unsupported_codec', 415);
    await expectInputError(probeAudioFile(write('sync.mp3.wav', Uint8Array.from([0xff, 0xfb, 0x90, 0x64, 0, 0, 0, 0, 0, 0, 0, 0]))), 'audio.unsupported_codec', 415);
  });
  it('MS ADPCM (format tag 2) → audio.unsupported_codec, 415', async () => {
    const b = good();
    new DataView(b.buffer).setUint16(20, 2, true);
    await expectInputError(probeAudioFile(write('adpcm.wav', b)), 'audio.unsupported_codec', 415);
  });
  it('extensible with a non-PCM SubFormat → audio.unsupported_codec, 415', async () => {
    const b = encodeWav(signal(2, 4800, 48000), 48000, { bits: 16, extensible: true });
    new DataView(b.buffer).setUint16(44, 0x55, true);
    await expectInputError(probeAudioFile(write('ext-mp3.wav', b)), 'audio.unsupported_codec', 415);
  });
  it('cut short in the data chunk (RIFF size says more) → audio.truncated, 400', async () => {
    await expectInputError(detectKickFile(write('cut.wav', good().subarray(0, 100_000))), 'audio.truncated', 400);
  });
  it('cut inside the header → audio.truncated, 400', async () => {
    await expectInputError(probeAudioFile(write('cut-header.wav', good().subarray(0, 30))), 'audio.truncated', 400);
    await expectInputError(probeAudioFile(write('cut-riff.wav', good().subarray(0, 6))), 'audio.truncated', 400);
  });
  it('a chunk size past the end of a file whose RIFF size is consistent → audio.chunk_past_end, 400', async () => {
    const b = encodeWav(signal(1, 4800, 48000), 48000, { bits: 16, extraChunks: [{ id: 'LIST', body: new Uint8Array(10) }] });
    new DataView(b.buffer).setUint32(36 + 4, 0x7fffffff, true);
    await expectInputError(probeAudioFile(write('list-past-end.wav', b)), 'audio.chunk_past_end', 400);
  });
  it('zero channels → audio.no_channels, 422', async () => {
    const b = good();
    new DataView(b.buffer).setUint16(22, 0, true);
    await expectInputError(probeAudioFile(write('no-channels.wav', b)), 'audio.no_channels', 422);
  });
  it('a block align that does not match channels × bits → audio.bad_fmt, 400', async () => {
    const b = good();
    new DataView(b.buffer).setUint16(32, 5, true);
    await expectInputError(probeAudioFile(write('bad-align.wav', b)), 'audio.bad_fmt', 400);
  });
  it('an empty data chunk → audio.no_samples, 422', async () => {
    await expectInputError(probeAudioFile(write('no-samples.wav', encodeWav([new Float32Array(0)], 48000, { bits: 16 }))), 'audio.no_samples', 422);
  });
  it('neither WAV nor MIDI, sniffed by detectKickFile → 415', async () => {
    await expectInputError(detectKickFile(write('flac.bin', new TextEncoder().encode('fLaC\0\0\0\x22 and more'))), 'audio.unsupported_codec', 415);
  });
});

describe('bass activity (for the bass gate)', () => {
  it('per-5 ms peak level: silence reads −Infinity, a −6 dBFS sine reads −6 dBFS (known by construction)', async () => {
    const fs = 48000;
    const x = new Float32Array(fs);
    for (let i = fs / 2; i < fs; i++) x[i] = 0.5 * Math.sin((2 * Math.PI * 55 * i) / fs);
    const path = write('bass-half.wav', encodeWav([x, x], fs, { bits: 32, float: true }));
    const activity = await bassActivityFromFile(path);
    expect(activity.hopSec).toBeCloseTo(0.005, 9);
    expect(activity.peakDbfs.length).toBe(200);
    expect(activity.peakDbfs[10]).toBe(-Infinity);
    // A 5 ms hop holds a quarter period of 55 Hz, so some hops miss the crest; the loudest is the crest.
    const loud = Math.max(...activity.peakDbfs.subarray(100));
    expect(loud).toBeCloseTo(20 * Math.log10(0.5), 2);
    expect(Math.min(...activity.peakDbfs.subarray(101))).toBeGreaterThan(-30);
  });
});

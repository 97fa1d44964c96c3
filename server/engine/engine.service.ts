import { closeSync, openSync, writeSync } from 'node:fs';
import type { Hit } from '../../shared/schemas/hit';
import { laneStampSchema, type LaneStampInput } from '../../shared/schemas/tuck-shape';
import type { CsvExportOptionsInput, MidiExportOptionsInput } from '../../shared/schemas/export-options';
import type { GainCurve, StampResult } from '../../shared/dsp/gain-curve';
import { stampHits } from '../../shared/dsp/stamp';
import { thinCurve, type ThinOptions } from '../../shared/dsp/curve-thin';
import { sampleGainCurve } from '../../shared/dsp/gain';
import { bassSilenceTest } from '../../shared/dsp/bass-gate';
import { createBandSplitter } from '../../shared/dsp/crossover';
import { writeBreakpointCsvBytes } from '../../shared/formats/csv-write';
import { writeMidiCc, type MidiLane } from '../../shared/formats/midi-write';
import { encodeWavSamples, wavHeader } from '../../shared/formats/wav-write';
import type { BassActivity } from '../audio/bass-activity';
import type { AudioInfo } from '../audio/audio-info';
import { openWav } from '../audio/wav-file';

/**
 * Error of the straight-in-dB pieces a curve meant for rendering samples its
 * ramps into, dB. 0.002 dB keeps the pieces' ripple (≈0.02 % of amplitude)
 * far below the −60 dB splatter budget; the live stamp uses 0.05 dB.
 */
export const RENDER_RAMP_TOLERANCE_DB = 0.002;

export interface StampForLaneOptions {
  /** Song length, seconds. */
  durationSec: number;
  /** Per-hop peaks of the lane's stem; with the lane's gate enabled, silent hits get no tuck. */
  bassActivity?: BassActivity;
  /** See `RENDER_RAMP_TOLERANCE_DB`; default 0.05 dB. */
  rampToleranceDb?: number;
}

/**
 * Stamps one lane: the lane's tuck shape at every enabled hit, base gain,
 * floor, slope guard and (given `bassActivity` and `lane.gate.enabled`) the
 * bass gate. The lane is parsed with `laneStampSchema` (defaults filled in).
 */
export function stampForLane(hits: readonly Hit[], lane: LaneStampInput, opts: StampForLaneOptions): StampResult {
  const l = laneStampSchema.parse(lane);
  const isBassSilent = opts.bassActivity && l.gate.enabled ? bassSilenceTest(opts.bassActivity, l.gate.thresholdDbfs) : undefined;
  return stampHits(hits, l.shape, { durationSec: opts.durationSec, baseGainDb: l.baseGainDb, isBassSilent, rampToleranceDb: opts.rampToleranceDb });
}

/** Breakpoint CSV of a curve (the file's bytes), thinned first (0.5 dB in dB and in amplitude above −40 dB, see curve-thin.ts). */
export function exportCsv(curve: GainCurve, opts: CsvExportOptionsInput & { thin?: ThinOptions } = {}): Uint8Array {
  const { thin, ...csv } = opts;
  return writeBreakpointCsvBytes(thinCurve(curve, thin), csv);
}

/** MIDI CC file (SMF type 1) of one or more lanes; `hits` feed the optional marker track. */
export function exportMidi(lanes: readonly MidiLane[], opts: MidiExportOptionsInput = {}, hits: readonly Hit[] = [], title = 'Tuckline'): Uint8Array {
  const markers = hits.filter((h) => h.enabled).map((h) => ({ timeSec: h.timeSec, strength: h.strength }));
  return writeMidiCc(lanes, opts, markers, title);
}

/**
 * Renders the ducked stem: bass × gain curve, sample by sample (linear in dB
 * between the curve's breakpoints, so pass a curve stamped with
 * `RENDER_RAMP_TOLERANCE_DB`, not a thinned one), block by block. The output
 * has the input's sample rate, channels, length, bit depth and int/float
 * coding, written with a plain format tag (1 or 3). Returns the output's info.
 *
 * With `lowBandHz` (GLOSSARY "Low-band tuck") only the band below that
 * crossover follows the curve: each channel is split by a Linkwitz–Riley
 * 4th-order crossover (shared/dsp/crossover.ts), the low band multiplied by
 * the gain, the high band left as it is, and the two summed — so the bass's
 * upper harmonics stay while its sub is tucked. With no tuck the bands sum
 * flat in magnitude (an all-pass; tested).
 */
export async function renderWavFile(bassPath: string, curve: GainCurve, outPath: string, opts: { lowBandHz?: number } = {}): Promise<AudioInfo> {
  const wav = await openWav(bassPath);
  let fd = -1;
  try {
    const { info } = wav;
    const fmt = { sampleRate: info.sampleRate, channels: info.channels, bitDepth: info.bitDepth, sampleFormat: info.sampleFormat };
    const header = wavHeader(fmt, info.frames);
    fd = openSync(outPath, 'w');
    writeSync(fd, header);
    let gains = new Float32Array(0);
    let bytes = new Uint8Array(0);
    const splitters = opts.lowBandHz ? Array.from({ length: info.channels }, () => createBandSplitter(opts.lowBandHz!, info.sampleRate)) : null;
    let low = new Float32Array(0);
    let high = new Float32Array(0);
    await wav.forEachBlock((block, firstFrame) => {
      const frames = block[0]?.length ?? 0;
      if (gains.length < frames) gains = new Float32Array(frames);
      sampleGainCurve(curve, frames, info.sampleRate, gains, firstFrame);
      if (splitters) {
        if (low.length < frames) {
          low = new Float32Array(frames);
          high = new Float32Array(frames);
        }
        block.forEach((ch, c) => {
          splitters[c].split(ch.subarray(0, frames), low.subarray(0, frames), high.subarray(0, frames));
          for (let n = 0; n < frames; n++) ch[n] = low[n] * gains[n] + high[n];
        });
      } else {
        for (const ch of block) for (let n = 0; n < frames; n++) ch[n] *= gains[n];
      }
      const size = frames * info.channels * (info.bitDepth / 8);
      if (bytes.length < size) bytes = new Uint8Array(size);
      encodeWavSamples(block, fmt, frames, bytes.subarray(0, size));
      writeSync(fd, bytes, 0, size);
    });
    const dataBytes = info.frames * info.channels * (info.bitDepth / 8);
    if (dataBytes & 1) writeSync(fd, new Uint8Array(1));
    return { ...info };
  } finally {
    if (fd >= 0) closeSync(fd);
    await wav.close();
  }
}

/** Convenience for renders: stamps a lane at render precision and writes the ducked stem. */
export async function renderLaneWavFile(bassPath: string, hits: readonly Hit[], lane: LaneStampInput, opts: Omit<StampForLaneOptions, 'rampToleranceDb'> & { lowBandHz?: number }, outPath: string): Promise<{ info: AudioInfo; stamp: StampResult }> {
  const stamp = stampForLane(hits, lane, { ...opts, rampToleranceDb: RENDER_RAMP_TOLERANCE_DB });
  const info = await renderWavFile(bassPath, stamp.curve, outPath, { lowBandHz: opts.lowBandHz });
  return { info, stamp };
}

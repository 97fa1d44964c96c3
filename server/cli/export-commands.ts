/**
 * The `stamp` and `report` commands. The entry point (server/cli/tuckline.ts)
 * imports this module only when one of them runs, so `detect` starts without
 * loading the schema library, the exporters or the meters.
 */
import { readFile, writeFile } from 'node:fs/promises';
import { basename, extname } from 'node:path';
import { tuckShapeSchema } from '../../shared/schemas/tuck-shape';
import type { Hit } from '../../shared/schemas/hit';
import { detectKickFile } from '../audio/kick-detection';
import { bassActivityFromFile } from '../audio/bass-activity';
import { probeAudioFile } from '../audio/audio-info';
import { exportCsv, exportMidi, renderWavFile, RENDER_RAMP_TOLERANCE_DB, stampForLane } from '../engine/engine.service';
import { readWavFile } from '../audio/wav-file';
import { computeHeadroomReport } from '../../shared/dsp/headroom-report';
import { InputError, numberFlag, parseArgs, round, UsageError, userPath } from './cli-args';

const STAMP_USAGE = `Usage: tuckline stamp <kick.wav|kick.mid> --shape <shape.json> --format csv|midi|wav --out <file> [options]

  --shape <file>        Tuck shape JSON: {"points":[{"tMs":-3,"gainDb":0},…],"slopeGuardMs":5,"depthDb":…,"floorDb":-60}
  --format csv|midi|wav Breakpoint CSV, MIDI CC file or the rendered bass stem
  --out <file>          Where to write the export
  --bass <bass.wav>     The bass stem: enables the bass gate; required for --format wav
  --bpm N               Song tempo for bar.beat.tick and MIDI ticks (default 120)
  --ppq N               MIDI ticks per quarter note (default 960)
  --cc N                MIDI controller (default 11, expression)
  --channel N           MIDI channel 1-16 (default 1)
  --fourteen-bit        14-bit MIDI controller (MSB on CC n, LSB on CC n+32)
  --markers             Add a MIDI track with a note at each hit
  --base-gain dB        The lane's gain outside tucks (default 0)
  --gate-threshold dBFS Bass below this peak counts as silent (default -50)
  --no-gate             Tuck every hit even where the bass is silent
  --name <text>         Lane (MIDI track) name (default: the bass file's name, or "Bass")
  --kind audio|midi     Force the kind of kick source (default: sniffed from the file)
  --low-band Hz         WAV only: tuck just the band below this crossover (Linkwitz-Riley, e.g. 120)

Prints a JSON summary: {"format","out","hits","stampedHits","gatedHits","durationSec"}.
Exit codes: 0 done, 1 a file or value cannot be used, 2 wrong usage.
`;
const REPORT_USAGE = `Usage: tuckline report <kick.wav> --bass <bass.wav> --shape <shape.json> [options]

Prints {"hits":N,"before":{"samplePeakDbfs":…,"truePeakDbtp":…,"integratedLufs":…},"after":{…},"headroomGainedDb":…}
measured on kick plus bass: sample peak (dBFS), true peak (dBTP, ITU-R BS.1770-4 Annex 2), integrated loudness
(LUFS, BS.1770-4 with gating). headroomGainedDb is the sample-peak reduction of the sum (before − after).
  --bass <bass.wav>     The bass stem to tuck (required)
  --shape <file>        Tuck shape JSON (required)
  --base-gain dB        The lane's gain outside tucks (default 0)
  --gate-threshold dBFS Bass below this peak counts as silent (default -50)
  --no-gate             Tuck every hit even where the bass is silent
  --hits <kick.mid>     Take the hits from a MIDI kick part instead of detecting them in the kick audio
Exit codes: 0 done, 1 a file or value cannot be used, 2 wrong usage.
`;
async function readShape(path: string) {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (e) {
    throw new InputError(`cannot read the shape file ${path}: ${(e as NodeJS.ErrnoException).code ?? (e as Error).message}`);
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch {
    throw new InputError(`the shape file ${path} is not valid JSON`);
  }
  const parsed = tuckShapeSchema.safeParse(json);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new InputError(`bad tuck shape in ${path}: ${issue.path.join('.') || '(root)'}: ${issue.message}`);
  }
  return parsed.data;
}

export async function stamp(argv: string[], out: (s: string) => void): Promise<void> {
  const valued = new Set(['shape', 'bass', 'bpm', 'ppq', 'cc', 'channel', 'format', 'out', 'base-gain', 'gate-threshold', 'name', 'kind', 'low-band']);
  const { positional, flags } = parseArgs(argv, valued, new Set(['fourteen-bit', 'markers', 'no-gate']));
  if (flags.help) return out(STAMP_USAGE);
  if (positional.length !== 1) throw new UsageError('stamp takes one kick file (tuckline stamp --help)');
  const format = flags.format;
  if (format !== 'csv' && format !== 'midi' && format !== 'wav') throw new UsageError('--format must be csv, midi or wav');
  if (typeof flags.shape !== 'string') throw new UsageError('--shape <shape.json> is required');
  if (typeof flags.out !== 'string') throw new UsageError('--out <file> is required');
  const bassArg = typeof flags.bass === 'string' ? flags.bass : undefined;
  if (format === 'wav' && !bassArg) throw new UsageError('--format wav needs --bass <bass.wav>');
  const bpm = numberFlag(flags, 'bpm', { min: 20, max: 400 }) ?? 120;
  const ppq = numberFlag(flags, 'ppq', { int: true, min: 24, max: 32767 }) ?? 960;
  const cc = numberFlag(flags, 'cc', { int: true, min: 0, max: 119 }) ?? 11;
  const channel = numberFlag(flags, 'channel', { int: true, min: 1, max: 16 }) ?? 1;
  const baseGainDb = numberFlag(flags, 'base-gain', { min: -60, max: 24 }) ?? 0;
  const thresholdDbfs = numberFlag(flags, 'gate-threshold', { min: -120, max: 0 }) ?? -50;
  const fourteenBit = flags['fourteen-bit'] === true;
  const lowBandHz = numberFlag(flags, 'low-band', { min: 30, max: 500 });
  if (lowBandHz !== undefined && format !== 'wav') throw new UsageError('--low-band applies to --format wav only');
  if (fourteenBit && cc > 31) throw new UsageError('--fourteen-bit needs --cc 0-31 (the LSB goes on CC n+32)');
  const kind = flags.kind;
  if (kind !== undefined && kind !== 'audio' && kind !== 'midi') throw new UsageError('--kind must be audio or midi');

  const shape = await readShape(userPath(flags.shape));
  const detection = await detectKickFile(userPath(positional[0]), { kind });
  const bassPath = bassArg ? userPath(bassArg) : undefined;
  const bassInfo = bassPath ? await probeAudioFile(bassPath) : undefined;
  const bassActivity = bassPath && flags['no-gate'] !== true ? await bassActivityFromFile(bassPath) : undefined;
  const durationSec = Math.max(detection.durationSec, bassInfo?.durationSec ?? 0);
  const name = typeof flags.name === 'string' ? flags.name : bassPath ? basename(bassPath, extname(bassPath)) : 'Bass';
  const lane = { name, shape, baseGainDb, gate: { enabled: true, thresholdDbfs } };
  const hits: Hit[] = detection.hits;
  const result = stampForLane(hits, lane, { durationSec, bassActivity, rampToleranceDb: format === 'wav' ? RENDER_RAMP_TOLERANCE_DB : undefined });
  const outPath = userPath(flags.out);
  if (format === 'csv') {
    const sampleRate = bassInfo?.sampleRate ?? detection.sampleRate ?? 48000;
    await writeFile(outPath, exportCsv(result.curve, { sampleRate, bpm, ppq }));
  } else if (format === 'midi') {
    await writeFile(outPath, exportMidi([{ name, curve: result.curve }], { bpm, ppq, cc, channel, fourteenBit, markerTrack: flags.markers === true }, hits));
  } else {
    await renderWavFile(bassPath!, result.curve, outPath, { lowBandHz });
  }
  out(
    JSON.stringify({
      format,
      out: outPath,
      hits: hits.length,
      stampedHits: result.stampedHitCount,
      gatedHits: result.gatedHitIndexes.length,
      durationSec: round(durationSec, 6),
    }) + '\n',
  );
}

export async function report(argv: string[], out: (s: string) => void): Promise<void> {
  const { positional, flags } = parseArgs(argv, new Set(['shape', 'bass', 'base-gain', 'gate-threshold', 'hits']), new Set(['no-gate']));
  if (flags.help) return out(REPORT_USAGE);
  if (positional.length !== 1) throw new UsageError('report takes one kick file (tuckline report --help)');
  if (typeof flags.bass !== 'string') throw new UsageError('--bass <bass.wav> is required');
  if (typeof flags.shape !== 'string') throw new UsageError('--shape <shape.json> is required');
  const baseGainDb = numberFlag(flags, 'base-gain', { min: -60, max: 24 }) ?? 0;
  const thresholdDbfs = numberFlag(flags, 'gate-threshold', { min: -120, max: 0 }) ?? -50;
  const shape = await readShape(userPath(flags.shape));
  const kickPath = userPath(positional[0]);
  const bassPath = userPath(flags.bass);
  const detection = await detectKickFile(typeof flags.hits === 'string' ? userPath(flags.hits) : kickPath, typeof flags.hits === 'string' ? {} : { kind: 'audio' });
  const [kick, bass] = [await readWavFile(kickPath), await readWavFile(bassPath)];
  if (kick.info.sampleRate !== bass.info.sampleRate) {
    throw new InputError(`the kick is at ${kick.info.sampleRate} Hz and the bass at ${bass.info.sampleRate} Hz; export both at one sample rate`);
  }
  const bassActivity = flags['no-gate'] !== true ? await bassActivityFromFile(bassPath) : undefined;
  const durationSec = Math.max(kick.info.durationSec, bass.info.durationSec);
  const lane = { name: 'Bass', shape, baseGainDb, gate: { enabled: true, thresholdDbfs } };
  const stamped = stampForLane(detection.hits, lane, { durationSec, bassActivity, rampToleranceDb: RENDER_RAMP_TOLERANCE_DB });
  const hits = detection.hits.filter((h) => h.enabled).map((h, i) => ({ id: String(i), timeSec: h.timeSec }));
  const result = computeHeadroomReport({ sampleRateHz: kick.info.sampleRate, kick: kick.channels, lanes: [{ id: 'bass', name: 'Bass', bass: bass.channels, curve: stamped.curve }], hits });
  const pick = (f: { samplePeakDbfs: number; truePeakDbtp: number; integratedLufs: number }) => ({
    samplePeakDbfs: finiteOrNull(f.samplePeakDbfs),
    truePeakDbtp: finiteOrNull(f.truePeakDbtp),
    integratedLufs: finiteOrNull(f.integratedLufs),
  });
  out(JSON.stringify({ hits: detection.hits.length, before: pick(result.sum.before), after: pick(result.sum.after), headroomGainedDb: finiteOrNull(result.headroomGainedDb.samplePeak) }) + '\n');
}

/** JSON has no −Infinity (silence): such a figure prints as null. Two decimals are well inside every meter's tolerance. */
function finiteOrNull(v: number): number | null {
  return Number.isFinite(v) ? round(v, 2) : null;
}

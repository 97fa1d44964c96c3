import { z } from 'zod';
import { DETECTION_DEFAULTS, MIDI_KICK_DEFAULTS } from './hit-defaults';

/**
 * One kick onset. `timeSec` is where the hit begins (the first sample of its
 * energy, not its peak), `sample` the same instant as a frame index at the
 * source's sample rate (absent for MIDI sources), `strength` the hit's level
 * relative to the loudest hit of the source (audio: low-band peak amplitude
 * ratio; MIDI: velocity / 127), `depthDb` an optional per-hit tuck depth.
 */
export const hitSchema = z.object({
  timeSec: z.number().finite().min(0),
  sample: z.number().int().min(0).optional(),
  strength: z.number().min(0).max(1),
  enabled: z.boolean(),
  depthDb: z.number().max(0).nullable().optional(),
});
export type Hit = z.infer<typeof hitSchema>;

/**
 * Options of the audio kick detector (shared/dsp/onsets.ts).
 * - sensitivity 0..1: higher finds quieter hits. 0.5 keeps hits down to about
 *   −30 dB below the loudest (ghost notes 20 dB down are kept) — our choice.
 * - minGapMs: two onsets closer than this are one hit. 50 ms keeps 1/32 notes
 *   at 150 BPM apart (60 / 150 / 8 = 50 ms).
 * - lowBandHz: edge of the low band the kick is detected in (8th-order
 *   Butterworth; 120 Hz puts a snare body at ~190 Hz 30 dB down). Kick
 *   fundamentals sit at about 40–60 Hz, the body's sweep starts higher
 *   (common practice, no source; REFERENCES.md "Ranges").
 */
export const detectionOptionsSchema = z.object({
  sensitivity: z.number().min(0).max(1).default(DETECTION_DEFAULTS.sensitivity),
  minGapMs: z.number().min(5).max(1000).default(DETECTION_DEFAULTS.minGapMs),
  lowBandHz: z.number().min(40).max(400).default(DETECTION_DEFAULTS.lowBandHz),
});
export type DetectionOptions = z.infer<typeof detectionOptionsSchema>;

/**
 * Which MIDI notes are kicks. Defaults: GM1 percussion map, 35 acoustic bass
 * drum and 36 bass drum 1 on channel 10 (REFERENCES.md, "General MIDI
 * percussion map"). `channel` is 1-based as on a keyboard; null means any.
 */
export const midiKickOptionsSchema = z.object({
  notes: z.array(z.number().int().min(0).max(127)).min(1).default(() => [...MIDI_KICK_DEFAULTS.notes]),
  channel: z.number().int().min(1).max(16).nullable().default(MIDI_KICK_DEFAULTS.channel),
});
export type MidiKickOptions = z.infer<typeof midiKickOptionsSchema>;

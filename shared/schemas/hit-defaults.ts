/**
 * Defaults of the kick detector and the MIDI kick reader, without zod, so the
 * detection path (shared/dsp/onsets.ts, shared/formats/midi-read.ts and the
 * command line's `detect`) loads no schema library. shared/schemas/hit.ts
 * uses the same values as its schema defaults; callers that take options
 * from users validate them with those schemas first.
 */

/** The detector's options (the same shape as z.infer of detectionOptionsSchema in ./hit). */
export interface DetectionSettings {
  sensitivity: number;
  minGapMs: number;
  lowBandHz: number;
}

/** The MIDI kick reader's options (the same shape as z.infer of midiKickOptionsSchema in ./hit). */
export interface MidiKickSettings {
  notes: number[];
  channel: number | null;
}

export const DETECTION_DEFAULTS: Readonly<DetectionSettings> = { sensitivity: 0.5, minGapMs: 50, lowBandHz: 120 };

export const MIDI_KICK_DEFAULTS: Readonly<MidiKickSettings> = { notes: [35, 36], channel: 10 };

/** Options already validated (or omitted) with the defaults filled in; undefined fields take the default. */
export function withDetectionDefaults(options: Partial<DetectionSettings> = {}): DetectionSettings {
  return {
    sensitivity: options.sensitivity ?? DETECTION_DEFAULTS.sensitivity,
    minGapMs: options.minGapMs ?? DETECTION_DEFAULTS.minGapMs,
    lowBandHz: options.lowBandHz ?? DETECTION_DEFAULTS.lowBandHz,
  };
}

export function withMidiKickDefaults(options: Partial<MidiKickSettings> = {}): MidiKickSettings {
  return {
    notes: options.notes ?? [...MIDI_KICK_DEFAULTS.notes],
    channel: options.channel === undefined ? MIDI_KICK_DEFAULTS.channel : options.channel,
  };
}

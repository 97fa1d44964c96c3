import { z } from 'zod';

const timeSignature = z
  .tuple([z.number().int().min(1).max(32), z.union([z.literal(1), z.literal(2), z.literal(4), z.literal(8), z.literal(16), z.literal(32)])])
  .default([4, 4]);

/** Options of the breakpoint CSV (shared/formats/csv-write.ts). */
export const csvExportOptionsSchema = z.object({
  /** For the `sample` column (frame index at this rate). */
  sampleRate: z.number().int().min(8000).max(384000).default(48000),
  /** Song tempo, quarter notes per minute, for the `bar_beat_tick` column. */
  bpm: z.number().min(20).max(400).default(120),
  timeSignature,
  /** Ticks per quarter note in `bar_beat_tick`. */
  ppq: z.number().int().min(24).max(32767).default(960),
});
export type CsvExportOptions = z.output<typeof csvExportOptionsSchema>;

/** Options of the MIDI CC file (shared/formats/midi-write.ts). */
export const midiExportOptionsSchema = z
  .object({
    /** Controller number; 11 = expression (REFERENCES.md "MIDI"). 120–127 are channel mode messages. */
    cc: z.number().int().min(0).max(119).default(11),
    /** 1-based MIDI channel. */
    channel: z.number().int().min(1).max(16).default(1),
    /** Division, ticks per quarter note (SMF division bit 15 = 0). */
    ppq: z.number().int().min(24).max(32767).default(960),
    /** MSB on CC n, LSB on CC n+32 (MIDI 1.0); needs n ≤ 31. */
    fourteenBit: z.boolean().default(false),
    /** Adds a track with a note at each hit. */
    markerTrack: z.boolean().default(false),
    bpm: z.number().min(20).max(400).default(120),
    timeSignature,
  })
  .refine((o) => !o.fourteenBit || o.cc <= 31, { message: '14-bit controllers need a CC number of 0–31 (the LSB goes on CC n+32).', path: ['cc'] });
export type MidiExportOptions = z.output<typeof midiExportOptionsSchema>;
export type MidiExportOptionsInput = z.input<typeof midiExportOptionsSchema>;
export type CsvExportOptionsInput = z.input<typeof csvExportOptionsSchema>;

/**
 * Seconds → ticks at a constant tempo: tick = round(seconds × bpm/60 × ppq),
 * bpm in quarter notes per minute, ppq ticks per quarter note (Standard MIDI
 * File 1.0 division; REFERENCES.md "MIDI").
 */
export function secondsToTicks(seconds: number, bpm: number, ppq: number): number {
  return Math.round((seconds * bpm * ppq) / 60);
}

export interface BarBeatTick {
  /** 1-based bar. */
  bar: number;
  /** 1-based beat within the bar, counted in the time signature's beat unit. */
  beat: number;
  /** Ticks into the beat, 0 … ticksPerBeat − 1. */
  tick: number;
}

/**
 * Seconds → bar.beat.tick at a constant tempo and time signature, as DAWs
 * count it (common practice, no source): 1-based bars and beats, ticks from 0.
 * A beat is one 1/denominator note, so ticksPerBeat = ppq·4/denominator and
 * ticksPerBar = ticksPerBeat·numerator. At 120 BPM, 4/4, 960 PPQ, 4.75 s =
 * 9120 ticks = bar 3, beat 2, tick 480 ("3.2.480").
 */
export function secondsToBarBeatTick(seconds: number, bpm: number, timeSignature: readonly [number, number], ppq: number): BarBeatTick {
  const [num, den] = timeSignature;
  const ticks = Math.max(0, secondsToTicks(seconds, bpm, ppq));
  const ticksPerBeat = (ppq * 4) / den;
  const ticksPerBar = ticksPerBeat * num;
  const bar = Math.floor(ticks / ticksPerBar);
  const inBar = ticks - bar * ticksPerBar;
  const beat = Math.floor(inBar / ticksPerBeat);
  return { bar: bar + 1, beat: beat + 1, tick: Math.round(inBar - beat * ticksPerBeat) };
}

/** "bar.beat.tick", e.g. "3.2.480". */
export function formatBarBeatTick(p: BarBeatTick): string {
  return `${p.bar}.${p.beat}.${p.tick}`;
}

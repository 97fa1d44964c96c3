import { describe, expect, it } from 'vitest';
import { formatBarBeatTick, secondsToBarBeatTick, secondsToTicks } from './bar-beat';

describe('bar.beat.tick', () => {
  it('counts 1-based bars and beats at 120 BPM, 4/4, 960 PPQ (common practice, no source; arithmetic known by construction)', () => {
    expect(formatBarBeatTick(secondsToBarBeatTick(0, 120, [4, 4], 960))).toBe('1.1.0');
    expect(formatBarBeatTick(secondsToBarBeatTick(4.75, 120, [4, 4], 960))).toBe('3.2.480');
    expect(formatBarBeatTick(secondsToBarBeatTick(2, 120, [4, 4], 960))).toBe('2.1.0');
  });

  it('counts beats in the time signature\'s unit: 6/8 has six eighth-note beats of 480 ticks', () => {
    // 6/8 at 120 quarter-note BPM: an eighth is 0.25 s; a bar is 1.5 s.
    expect(formatBarBeatTick(secondsToBarBeatTick(1.5, 120, [6, 8], 960))).toBe('2.1.0');
    expect(formatBarBeatTick(secondsToBarBeatTick(1.5 + 0.25 * 5 + 0.125, 120, [6, 8], 960))).toBe('2.6.240');
  });

  it('ticks = round(seconds × bpm/60 × ppq) (REFERENCES.md "MIDI", constant tempo)', () => {
    expect(secondsToTicks(1, 120, 960)).toBe(1920);
    expect(secondsToTicks(0.5, 140, 480)).toBe(560);
  });
});

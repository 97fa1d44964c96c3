import { averagedKickEnvelope } from './kick-envelope';

describe('averagedKickEnvelope', () => {
  it('averages the peaks after each hit and normalises them to 1', () => {
    // 1 kHz "sample rate", 10 samples per bucket = 10 ms buckets; two hits at 0.1 s and 0.5 s.
    const peaks: number[] = [];
    for (let i = 0; i < 100; i++) {
      const sinceHit = i >= 50 ? i - 50 : i - 10;
      const a = sinceHit >= 0 && sinceHit < 5 ? (i >= 50 ? 0.5 : 1) * (1 - sinceHit / 5) : 0;
      peaks.push(-a, a);
    }
    const env = averagedKickEnvelope({ stemId: 's', sampleRateHz: 1000, frames: 1000, durationSec: 1, levels: [{ samplesPerBucket: 10, peaks }] }, [0.1, 0.5], 20, 60)!;
    const at = (ms: number) => env.find((p) => Math.round(p.tMs) === ms)!.gainDb;
    expect(Math.round(env[0].tMs)).toBe(-20);
    expect(at(0)).toBe(1); // (1 + 0.5) / 2, the loudest bucket
    expect(at(20)).toBeCloseTo(0.6, 9); // (0.6 + 0.3) / 2 / 0.75
    expect(at(-10)).toBe(0);
    expect(Math.round(env.at(-1)!.tMs)).toBe(60);
  });

  it('has nothing to show without hits', () => {
    expect(averagedKickEnvelope({ stemId: 's', sampleRateHz: 48000, frames: 0, durationSec: 0, levels: [{ samplesPerBucket: 256, peaks: [] }] }, [])).toBeNull();
  });
});

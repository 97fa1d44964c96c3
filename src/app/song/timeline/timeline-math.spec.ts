import { beatGrid, clampView, pickLevel, rulerTicks, zoomView } from './timeline-math';

describe('timeline math', () => {
  it('zooms about the pointer and never leaves the song', () => {
    const v = zoomView({ t0: 0, t1: 100 }, 0.5, 50, 100);
    expect(v).toEqual({ t0: 25, t1: 75 });
    const edge = zoomView({ t0: 0, t1: 10 }, 4, 0, 20);
    expect(edge).toEqual({ t0: 0, t1: 20 });
    expect(zoomView({ t0: 1, t1: 1.001 }, 0.1, 1, 20).t1 - 1).toBeCloseTo(0.002, 9);
    expect(clampView({ t0: -5, t1: 5 }, 100)).toEqual({ t0: 0, t1: 10 });
  });

  it('counts beats in the time signature’s unit', () => {
    expect(beatGrid(120, 4, 4)).toEqual({ beatSec: 0.5, barSec: 2 });
    expect(beatGrid(120, 6, 8)).toEqual({ beatSec: 0.25, barSec: 1.5 });
  });

  it('labels bars, or bars and beats when there is room', () => {
    const wide = rulerTicks({ t0: 0, t1: 4 }, 1000, 120, 4, 4);
    expect(wide.map((t) => t.label)).toEqual(['1', '1.2', '1.3', '1.4', '2', '2.2', '2.3', '2.4', '3']);
    const far = rulerTicks({ t0: 0, t1: 200 }, 800, 120, 4, 4);
    expect(far[0].label).toBe('1');
    expect(far.length).toBeLessThanOrEqual(800 / 56 + 1);
    expect(far.every((t) => t.major)).toBe(true);
  });

  it('picks the coarsest overview level no wider than a pixel', () => {
    const ov = { stemId: 's', sampleRateHz: 48000, frames: 48000 * 60, durationSec: 60, levels: [256, 2048, 16384].map((n) => ({ samplesPerBucket: n, peaks: [] })) };
    expect(pickLevel(ov, { t0: 0, t1: 60 }, 1000)?.samplesPerBucket).toBe(2048); // 2880 samples per px
    expect(pickLevel(ov, { t0: 0, t1: 0.01 }, 1000)?.samplesPerBucket).toBe(256);
  });
});

import { buildTuckTemplate, easeDb, slopeCaps } from '../../../../shared/dsp/slope-guard';
import { TuckShape } from '../../../../shared/schemas/tuck-shape';

export interface XY {
  tMs: number;
  gainDb: number;
}

/** The drawn shape as a polyline: smooth segments sampled along the same ease the engine uses. */
export function drawnOutline(shape: TuckShape, samplesPerEase = 24): XY[] {
  const caps = slopeCaps(shape, 0);
  const out: XY[] = [];
  shape.points.forEach((a, i) => {
    out.push({ tMs: a.tMs, gainDb: a.gainDb });
    const b = shape.points[i + 1];
    if (!b || a.curve !== 'smooth') return;
    for (let k = 1; k < samplesPerEase; k++) {
      const u = k / samplesPerEase;
      out.push({ tMs: a.tMs + (b.tMs - a.tMs) * u, gainDb: easeDb(a.gainDb, b.gainDb, u, caps) });
    }
  });
  return out;
}

/** The shape as the slope guard will write it (engine template, relative to the base gain). */
export function guardedOutline(shape: TuckShape): XY[] {
  const tpl = buildTuckTemplate(shape);
  return Array.from(tpl.tMs, (tMs, i) => ({ tMs, gainDb: tpl.gainDb[i] }));
}

/** A view that shows the whole drawn and guarded shape with a margin: time range ms, lowest dB. */
export function shapeDomain(drawn: XY[], guarded: XY[]): { t0: number; t1: number; gMin: number } {
  const all = [...drawn, ...guarded];
  const tLo = Math.min(...all.map((p) => p.tMs), -5);
  const tHi = Math.max(...all.map((p) => p.tMs), 60);
  const span = tHi - tLo;
  const gLo = Math.min(...all.map((p) => p.gainDb), -12);
  return { t0: tLo - span * 0.06, t1: tHi + span * 0.06, gMin: Math.floor((gLo - 3) / 6) * 6 };
}

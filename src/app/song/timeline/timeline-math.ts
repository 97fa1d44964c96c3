import { StemOverview } from '../../../../shared/schemas/stem';

export interface TimeView {
  t0: number;
  t1: number;
}

/** The shortest span the timeline zooms to, s: a couple of milliseconds across the whole width. */
export const MIN_SPAN_SEC = 0.002;

/** Zooms by `factor` (< 1 zooms in) about the time `atSec`, kept inside [0, duration]. */
export function zoomView(view: TimeView, factor: number, atSec: number, durationSec: number): TimeView {
  const span = Math.min(durationSec, Math.max(MIN_SPAN_SEC, (view.t1 - view.t0) * factor));
  const frac = (atSec - view.t0) / (view.t1 - view.t0 || 1);
  return clampView({ t0: atSec - span * frac, t1: atSec - span * frac + span }, durationSec);
}

export function panView(view: TimeView, deltaSec: number, durationSec: number): TimeView {
  return clampView({ t0: view.t0 + deltaSec, t1: view.t1 + deltaSec }, durationSec);
}

/** Centres the view on a time, keeping its span. */
export function centreOn(view: TimeView, atSec: number, durationSec: number): TimeView {
  const half = (view.t1 - view.t0) / 2;
  return clampView({ t0: atSec - half, t1: atSec + half }, durationSec);
}

export function clampView(view: TimeView, durationSec: number): TimeView {
  const span = Math.min(durationSec, Math.max(MIN_SPAN_SEC, view.t1 - view.t0));
  const t0 = Math.min(Math.max(0, view.t0), Math.max(0, durationSec - span));
  return { t0, t1: t0 + span };
}

/**
 * The overview level to draw: the coarsest whose buckets are still no wider
 * than a pixel, else the finest there is.
 */
export function pickLevel(overview: StemOverview, view: TimeView, widthPx: number): StemOverview['levels'][number] | null {
  if (!overview.levels.length) return null;
  const samplesPerPx = ((view.t1 - view.t0) * overview.sampleRateHz) / Math.max(1, widthPx);
  const sorted = [...overview.levels].sort((a, b) => b.samplesPerBucket - a.samplesPerBucket);
  return sorted.find((l) => l.samplesPerBucket <= samplesPerPx) ?? sorted[sorted.length - 1];
}

/** Seconds per beat and per bar; `bpm` counts quarter notes, a beat is one 1/beatUnit note. */
export function beatGrid(bpm: number, beats: number, beatUnit: number): { beatSec: number; barSec: number } {
  const beatSec = (60 / bpm) * (4 / beatUnit);
  return { beatSec, barSec: beatSec * beats };
}

export interface RulerTick {
  timeSec: number;
  label: string;
  major: boolean;
}

/** Bar and beat ticks for the view, thinned so labels sit at least `minPx` apart. */
export function rulerTicks(view: TimeView, widthPx: number, bpm: number, beats: number, beatUnit: number, minPx = 56): RulerTick[] {
  const { beatSec, barSec } = beatGrid(bpm, beats, beatUnit);
  const pxPerSec = widthPx / (view.t1 - view.t0);
  const ticks: RulerTick[] = [];
  if (beatSec * pxPerSec >= minPx) {
    const first = Math.max(0, Math.floor(view.t0 / beatSec));
    for (let k = first; k * beatSec <= view.t1 && ticks.length < 400; k++) {
      const bar = Math.floor(k / beats) + 1;
      const beat = (k % beats) + 1;
      ticks.push({ timeSec: k * beatSec, label: beat === 1 ? `${bar}` : `${bar}.${beat}`, major: beat === 1 });
    }
    return ticks;
  }
  let every = 1;
  while (barSec * every * pxPerSec < minPx) every *= 2;
  const first = Math.max(0, Math.floor(view.t0 / (barSec * every)) * every);
  for (let b = first; b * barSec <= view.t1 && ticks.length < 400; b += every) ticks.push({ timeSec: b * barSec, label: `${b + 1}`, major: true });
  return ticks;
}

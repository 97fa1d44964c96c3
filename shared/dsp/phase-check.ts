import { linkwitzRiley4LowBands } from './crossover';

export interface HitPhase {
  timeSec: number;
  /** Pearson correlation of kick and bass in the low band over the hit window, −1..1 (NaN when either is silent). */
  correlation: number;
  /** Peak of kick + bass against the louder part's peak, dB: +6.02 = fully adding, very negative = cancelling. */
  sumVsLouderDb: number;
  flag: 'adds' | 'cancels' | null;
}

export interface PhaseSuggestion {
  /** Flip the bass's polarity? */
  invertBass: boolean;
  /** Move the bass by this much, ms (positive = later), within ±maxOffsetMs. */
  offsetMs: number;
  /** Mean correlation over the checked hits now and with the suggestion applied. */
  meanCorrelationNow: number;
  meanCorrelationSuggested: number;
}

export interface PhaseCheckOptions {
  crossoverHz?: number;
  windowBeforeMs?: number;
  windowAfterMs?: number;
  /** |sumVsLouderDb| beyond which a hit is flagged. +3 dB "adds", −3 dB "cancels" — our choice. */
  flagDb?: number;
  maxOffsetMs?: number;
  offsetStepMs?: number;
}

/**
 * The phase check (GLOSSARY "Phase check"): per hit, in the low band below the
 * crossover (LR4), the correlation of kick and bass and how the sum's peak
 * compares with the louder part's — two equal in-phase sines add +6.02 dB, a
 * polarity-inverted copy cancels (REFERENCES.md "Summing"). For the song, the
 * polarity and bass offset (±5 ms) that maximise the mean correlation, as advice.
 *
 * @param kickMono kick, mono, −1..1
 * @param bassMono bass, mono, same rate
 * @param lowBands where the two low bands are written, as long as each input
 *   (an input itself may serve: it is then filtered in place)
 */
export function phaseCheck(
  kickMono: Float32Array,
  bassMono: Float32Array,
  sampleRateHz: number,
  hitTimesSec: readonly number[],
  options: PhaseCheckOptions = {},
  lowBands: [kick: Float32Array, bass: Float32Array] = [new Float32Array(kickMono.length), new Float32Array(bassMono.length)],
): { hits: HitPhase[]; suggestion: PhaseSuggestion } {
  const o = { crossoverHz: 150, windowBeforeMs: 0, windowAfterMs: 60, flagDb: 3, maxOffsetMs: 5, offsetStepMs: 0.5, ...options };
  // Only the low band is compared, so the high band is never computed.
  const [k, b] = linkwitzRiley4LowBands([kickMono, bassMono], o.crossoverHz, sampleRateHz, lowBands);
  const before = Math.round((o.windowBeforeMs / 1000) * sampleRateHz);
  const after = Math.round((o.windowAfterMs / 1000) * sampleRateHz);
  const n = Math.min(k.length, b.length);

  const stats = (start: number, shift: number, sign: number) => {
    let kk = 0, bb = 0, kb = 0, pk = 0, pb = 0, ps = 0;
    for (let i = Math.max(0, start - before); i < Math.min(n, start + after); i++) {
      const j = i - shift;
      const bv = j >= 0 && j < n ? sign * b[j] : 0;
      const kv = k[i];
      kk += kv * kv;
      bb += bv * bv;
      kb += kv * bv;
      pk = Math.max(pk, Math.abs(kv));
      pb = Math.max(pb, Math.abs(bv));
      ps = Math.max(ps, Math.abs(kv + bv));
    }
    return { r: kb / Math.sqrt(kk * bb), sumVsLouderDb: 20 * Math.log10(ps / Math.max(pk, pb)) };
  };

  const starts = hitTimesSec.map((t) => Math.round(t * sampleRateHz));
  const hits: HitPhase[] = starts.map((s, i) => {
    const { r, sumVsLouderDb } = stats(s, 0, 1);
    const flag = sumVsLouderDb >= o.flagDb ? 'adds' : sumVsLouderDb <= -o.flagDb ? 'cancels' : null;
    return { timeSec: hitTimesSec[i], correlation: r, sumVsLouderDb, flag };
  });

  // Mean correlation with the bass moved by each offset (samples; the first is "now").
  // Only the cross term and the bass energy change with the shift; flipping the polarity
  // just negates r, so one pass serves both signs. Hit by hit, so each window is read
  // while it is still in cache rather than once per offset across the whole song.
  const offsetsMs: number[] = [];
  for (let ms = -o.maxOffsetMs; ms <= o.maxOffsetMs + 1e-9; ms += o.offsetStepMs) offsetsMs.push(ms);
  const shifts = [0, ...offsetsMs.map((ms) => Math.round((ms / 1000) * sampleRateHz))];
  const sumR = new Float64Array(shifts.length);
  const countR = new Float64Array(shifts.length);
  for (const s of starts) {
    let kk = 0;
    for (let i = Math.max(0, s - before); i < Math.min(n, s + after); i++) kk += k[i] * k[i];
    const add = (q: number, bb: number, kb: number) => {
      const r = kb / Math.sqrt(kk * bb);
      if (Number.isFinite(r)) {
        sumR[q] += r;
        countR[q]++;
      }
    };
    let q = 0;
    // Two offsets per loop where both windows are whole (four independent sums keep the processor busy);
    // each sum still runs in sample order, so the figures are those of one offset at a time.
    for (; q + 1 < shifts.length; q += 2) {
      const s1 = shifts[q];
      const s2 = shifts[q + 1];
      const lo = Math.max(0, s - before, s1);
      const hi = Math.min(n, s + after, n + s1);
      if (lo !== Math.max(0, s - before, s2) || hi !== Math.min(n, s + after, n + s2)) break;
      let bb1 = 0, kb1 = 0, bb2 = 0, kb2 = 0;
      for (let i = lo; i < hi; i++) {
        const kv = k[i];
        const b1 = b[i - s1];
        const b2 = b[i - s2];
        bb1 += b1 * b1;
        kb1 += kv * b1;
        bb2 += b2 * b2;
        kb2 += kv * b2;
      }
      add(q, bb1, kb1);
      add(q + 1, bb2, kb2);
    }
    for (; q < shifts.length; q++) {
      const shift = shifts[q];
      let bb = 0;
      let kb = 0;
      const lo = Math.max(0, s - before, shift);
      const hi = Math.min(n, s + after, n + shift);
      for (let i = lo; i < hi; i++) {
        const bv = b[i - shift];
        bb += bv * bv;
        kb += k[i] * bv;
      }
      add(q, bb, kb);
    }
  }
  const meanR = (q: number) => (countR[q] ? sumR[q] / countR[q] : NaN);
  const now = meanR(0);
  let best = { invertBass: false, offsetMs: 0, r: now };
  offsetsMs.forEach((ms, q) => {
    const r = meanR(q + 1);
    for (const [invertBass, value] of [[false, r], [true, -r]] as const) {
      if (value > best.r + 1e-6) best = { invertBass, offsetMs: Math.round(ms * 10) / 10, r: value };
    }
  });
  return { hits, suggestion: { invertBass: best.invertBass, offsetMs: best.offsetMs, meanCorrelationNow: now, meanCorrelationSuggested: best.r } };
}

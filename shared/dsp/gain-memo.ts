/** ln10/20 per dB: 10^(G/20) = e^(G·ln10/20) (the decibel for amplitude quantities, IEC 60027-3). */
export const NEPER_PER_DB = Math.LN10 / 20;

/** Slots of a memo (a power of two: 2^12). */
const SLOTS = 4096;

/**
 * A function of a gain in dB, memoised in a small direct-mapped table keyed
 * by the exact dB value. A stamped curve repeats the same few dozen gains at
 * every hit (one template per depth), so most look-ups skip the function
 * (`Math.exp` and `Math.pow` cost several times a look-up here). The value
 * for a given dB is always the function's own, memoised or not. Our choice.
 */
export class DbMemo {
  private readonly keys = new Float64Array(SLOTS).fill(NaN);
  private readonly values = new Float64Array(SLOTS);
  private readonly bits = new Float64Array(1);
  private readonly words = new Uint32Array(this.bits.buffer);

  constructor(private readonly fn: (gainDb: number) => number) {}

  /** fn(gainDb). */
  of(gainDb: number): number {
    this.bits[0] = gainDb;
    const slot = Math.imul(this.words[0] ^ this.words[1], 0x9e3779b1) >>> 20;
    if (this.keys[slot] !== gainDb) {
      this.keys[slot] = gainDb;
      this.values[slot] = this.fn(gainDb);
    }
    // Always read back from the table: one path for the optimiser, a raw double, so
    // an inlined look-up allocates no heap number for its result.
    return this.values[slot];
  }
}

/**
 * dB → linear amplitude, a = e^(G·ln10/20) = 10^(G/20), memoised (`DbMemo`).
 * `Math.exp` rather than `Math.pow(10, ·)`, which takes about three times as
 * long here and differs by a few ulps.
 */
export function amplitudeMemo(): DbMemo {
  return new DbMemo(amplitude);
}

// One function for every memo, not a closure per memo: `DbMemo.of` is optimised for the functions it has seen called.
function amplitude(gainDb: number): number {
  return Math.exp(gainDb * NEPER_PER_DB);
}

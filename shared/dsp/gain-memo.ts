/** ln10/20 per dB: 10^(G/20) = e^(G·ln10/20) (the decibel for amplitude quantities, IEC 60027-3). */
const NEPER_PER_DB = Math.LN10 / 20;

/** Slots of the memo (a power of two). */
const SLOTS = 4096;

/**
 * dB → linear amplitude, a = e^(G·ln10/20) = 10^(G/20), memoised in a small
 * direct-mapped table keyed by the exact dB value. A stamped curve repeats
 * the same few dozen gains at every hit (one template per depth), so most
 * look-ups skip the `Math.exp` (which costs several times a look-up here).
 * The value for a given G is always the same double, memoised or not. Our
 * choice; `Math.exp` rather than `Math.pow(10, ·)`, which takes about three
 * times as long and differs by a few ulps.
 */
export class GainMemo {
  private readonly keys = new Float64Array(SLOTS).fill(NaN);
  private readonly values = new Float64Array(SLOTS);
  private readonly bits = new Float64Array(1);
  private readonly words = new Uint32Array(this.bits.buffer);

  /** 10^(gainDb/20), within a few ulps. */
  amplitude(gainDb: number): number {
    this.bits[0] = gainDb;
    const slot = Math.imul(this.words[0] ^ this.words[1], 0x9e3779b1) >>> 20;
    if (this.keys[slot] === gainDb) return this.values[slot];
    const a = Math.exp(gainDb * NEPER_PER_DB);
    this.keys[slot] = gainDb;
    this.values[slot] = a;
    return a;
  }
}

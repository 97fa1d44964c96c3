/**
 * Mono mixdown: out[offset + i] = (1/C) · Σc channels[c][i], the mean of the
 * channels (a sum divided by the channel count, so a full-scale signal on
 * every channel stays full scale; common practice, no source). Writes into
 * `out` so a block-wise reader allocates nothing per block.
 * @param channels one Float32Array per channel, equal lengths, linear full scale ±1
 * @param out destination, linear full scale
 * @param offset first index of `out` written
 */
export function mixdownInto(channels: readonly Float32Array[], out: Float32Array, offset = 0): void {
  const n = channels[0]?.length ?? 0;
  const c = channels.length;
  if (c === 1) {
    out.set(channels[0]!, offset);
    return;
  }
  const scale = 1 / c;
  if (c === 2) {
    const l = channels[0]!;
    const r = channels[1]!;
    for (let i = 0; i < n; i++) out[offset + i] = (l[i]! + r[i]!) * scale;
    return;
  }
  for (let i = 0; i < n; i++) {
    let sum = 0;
    for (let ch = 0; ch < c; ch++) sum += channels[ch]![i]!;
    out[offset + i] = sum * scale;
  }
}

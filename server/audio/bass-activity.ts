import { openWav } from './wav-file';

/** Per-hop peak level of a stem, for the bass gate ("is the bass silent in [t0, t1]?"). */
export interface BassActivity {
  hopSec: number;
  /** Sample peak over all channels in each hop, dBFS (20·log10 |x|max; −Infinity for digital silence). */
  peakDbfs: Float32Array;
}

/** 5 ms hops: fine enough for a tuck's lead-in, 200 values a second. Our choice. */
const HOP_SEC = 0.005;

/**
 * Peak level per 5 ms hop of a WAV file, block by block (memory: one
 * Float32Array of frames / hop). Hop k covers frames [k·h, (k+1)·h) with
 * h = round(0.005 · sampleRate); peakDbfs[k] = 20·log10(max |x|).
 */
export async function bassActivityFromFile(path: string): Promise<BassActivity> {
  const wav = await openWav(path);
  try {
    const hop = Math.max(1, Math.round(HOP_SEC * wav.info.sampleRate));
    const peaks = new Float32Array(Math.ceil(wav.info.frames / hop));
    await wav.forEachBlock((block, first) => {
      for (const channel of block) {
        for (let i = 0; i < channel.length; i++) {
          const a = Math.abs(channel[i]!);
          const k = ((first + i) / hop) | 0;
          if (a > peaks[k]!) peaks[k] = a;
        }
      }
    });
    const peakDbfs = peaks.map((a) => 20 * Math.log10(a));
    return { hopSec: hop / wav.info.sampleRate, peakDbfs };
  } finally {
    await wav.close();
  }
}

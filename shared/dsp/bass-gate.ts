/** Per-hop peak level of a bass stem (server/audio/bass-activity.ts makes it; the browser gets it as JSON). */
export interface BassActivityLevels {
  /** Hop length, seconds. */
  hopSec: number;
  /** Sample peak per hop, dBFS; digital silence may be −Infinity (or any value below −150). */
  peakDbfs: ArrayLike<number>;
}

/**
 * The bass gate's question (GLOSSARY "Bass gate"): is the bass silent over the
 * whole window [t0Sec, t1Sec]? Silent means every hop touching the window peaks
 * below `thresholdDbfs`. Cost: O(hops in the window).
 */
export function bassSilenceTest(activity: BassActivityLevels, thresholdDbfs: number): (t0Sec: number, t1Sec: number) => boolean {
  const { hopSec, peakDbfs } = activity;
  const n = peakDbfs.length;
  return (t0Sec, t1Sec) => {
    const first = Math.max(0, Math.floor(t0Sec / hopSec));
    const last = Math.min(n - 1, Math.floor(t1Sec / hopSec));
    for (let k = first; k <= last; k++) if (peakDbfs[k] >= thresholdDbfs) return false;
    return true;
  };
}

/**
 * The Web Audio graph of the preview: every source starts together so the A/B
 * switch (tucks on/off) keeps the position; the mix passes a master gain that
 * starts low, then a safety limiter, then a hard ceiling, before the speakers.
 *
 *   kick ───────────────┐
 *   bass (as is)  ─ A ──┤
 *   bass (tucked) ─ B ──┼─ lane gain (mute/solo) ─ master ─ limiter ─ ceiling ─ out
 */
export interface PreviewLane {
  id: string;
  original: AudioBuffer;
  tucked: AudioBuffer;
}

/** The level a preview starts at, dB: quiet on purpose (loud sub bass harms hearing and speakers). */
export const START_LEVEL_DB = -20;
/** Highest master level the slider allows, dB. */
export const MAX_LEVEL_DB = -6;
/** The ceiling after the limiter, linear (≈ −1 dBFS): nothing louder reaches the output. */
const CEILING = 0.89;

export const dbToGain = (db: number) => Math.pow(10, db / 20);

/** A copy of `buffer` multiplied sample by sample by `gains` (linear, one per frame). */
export function tuckedCopy(context: BaseAudioContext, buffer: AudioBuffer, gains: Float32Array): AudioBuffer {
  const out = context.createBuffer(buffer.numberOfChannels, buffer.length, buffer.sampleRate);
  for (let c = 0; c < buffer.numberOfChannels; c++) {
    const src = buffer.getChannelData(c);
    const dst = out.getChannelData(c);
    for (let i = 0; i < src.length; i++) dst[i] = src[i] * (i < gains.length ? gains[i] : 1);
  }
  return out;
}

export class PreviewGraph {
  private readonly master: GainNode;
  private sources: AudioBufferSourceNode[] = [];
  private laneGains = new Map<string, GainNode>();
  private abGains: { a: GainNode; b: GainNode }[] = [];
  private startedAt = 0;
  private offsetSec = 0;
  private tucksOn = true;
  private loop: { fromSec: number; toSec: number } | null = null;

  constructor(
    readonly context: AudioContext,
    private readonly kick: AudioBuffer | null,
    private readonly lanes: PreviewLane[],
  ) {
    this.master = context.createGain();
    this.master.gain.value = dbToGain(START_LEVEL_DB);
    // Safety limiter: fast, hard knee, high ratio; then a waveshaper ceiling for anything it lets through.
    const limiter = context.createDynamicsCompressor();
    limiter.threshold.value = -6;
    limiter.knee.value = 0;
    limiter.ratio.value = 20;
    limiter.attack.value = 0.001;
    limiter.release.value = 0.1;
    const ceiling = context.createWaveShaper();
    const curve = new Float32Array(1025);
    for (let i = 0; i < curve.length; i++) {
      const x = (i / (curve.length - 1)) * 2 - 1;
      curve[i] = Math.max(-CEILING, Math.min(CEILING, x));
    }
    ceiling.curve = curve;
    this.master.connect(limiter).connect(ceiling).connect(context.destination);
  }

  get playing(): boolean {
    return this.sources.length > 0;
  }

  get durationSec(): number {
    return Math.max(this.kick?.duration ?? 0, ...this.lanes.map((l) => l.original.duration));
  }

  /** Where playback is now, seconds into the song. */
  positionSec(): number {
    if (!this.playing) return this.offsetSec;
    const t = this.offsetSec + (this.context.currentTime - this.startedAt);
    if (this.loop) {
      const span = this.loop.toSec - this.loop.fromSec;
      return t < this.loop.toSec ? t : this.loop.fromSec + ((t - this.loop.fromSec) % span);
    }
    return Math.min(t, this.durationSec);
  }

  setLevelDb(db: number): void {
    this.master.gain.setTargetAtTime(dbToGain(Math.min(MAX_LEVEL_DB, db)), this.context.currentTime, 0.02);
  }

  /** A/B: tucks on (B) or off (A), crossfaded over ~10 ms so the switch does not click. */
  setTucks(on: boolean): void {
    this.tucksOn = on;
    const now = this.context.currentTime;
    for (const { a, b } of this.abGains) {
      a.gain.setTargetAtTime(on ? 0 : 1, now, 0.003);
      b.gain.setTargetAtTime(on ? 1 : 0, now, 0.003);
    }
  }

  /** Mute or solo per lane; the kick always plays. */
  setLaneLevels(audible: (laneId: string) => boolean): void {
    for (const [id, g] of this.laneGains) g.gain.setTargetAtTime(audible(id) ? 1 : 0, this.context.currentTime, 0.005);
  }

  setLoop(loop: { fromSec: number; toSec: number } | null): void {
    this.loop = loop && loop.toSec > loop.fromSec ? loop : null;
    if (this.playing) this.play(this.loop ? this.loop.fromSec : this.positionSec());
  }

  play(fromSec = this.offsetSec, audible: (laneId: string) => boolean = () => true): void {
    this.stop();
    void this.context.resume();
    const at = this.context.currentTime + 0.03;
    const start = (buffer: AudioBuffer, into: AudioNode) => {
      const s = this.context.createBufferSource();
      s.buffer = buffer;
      if (this.loop) {
        s.loop = true;
        s.loopStart = this.loop.fromSec;
        s.loopEnd = this.loop.toSec;
      }
      s.connect(into);
      s.start(at, Math.min(fromSec, buffer.duration));
      this.sources.push(s);
    };
    if (this.kick) start(this.kick, this.master);
    this.abGains = [];
    this.laneGains.clear();
    for (const lane of this.lanes) {
      const laneGain = this.context.createGain();
      laneGain.gain.value = audible(lane.id) ? 1 : 0;
      laneGain.connect(this.master);
      const a = this.context.createGain();
      const b = this.context.createGain();
      a.gain.value = this.tucksOn ? 0 : 1;
      b.gain.value = this.tucksOn ? 1 : 0;
      a.connect(laneGain);
      b.connect(laneGain);
      start(lane.original, a);
      start(lane.tucked, b);
      this.abGains.push({ a, b });
      this.laneGains.set(lane.id, laneGain);
    }
    this.startedAt = at;
    this.offsetSec = fromSec;
  }

  pause(): void {
    this.offsetSec = this.positionSec();
    this.stop();
  }

  private stop(): void {
    for (const s of this.sources) {
      try {
        s.stop();
      } catch {
        // Already ended on its own.
      }
      s.disconnect();
    }
    this.sources = [];
  }

  dispose(): void {
    this.stop();
    void this.context.close();
  }
}

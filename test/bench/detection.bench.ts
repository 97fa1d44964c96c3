/**
 * Kick-detection benchmark: the 5-minute 48 kHz stereo 24-bit kick stem
 * (test/reference/fixtures/long-stem.ts), analysed by Tuckline's CLI
 * (`npm run -s tuckline -- detect <file>`, and `node dist/cli/tuckline.mjs`
 * directly, on one thread and on two, server/audio/detection-split.ts) and by aubioonset (`-O energy` and `hfc -H 128`; REFERENCES.md
 * "Onsets"). Wall time, CPU time and peak RSS come from `/usr/bin/time -v`
 * (GNU time: "Maximum resident set size" is the largest process of the tree). Accuracy is
 * MIREX-style F at ±5 ms and the median error (test/reference/onset-scoring.ts).
 */
import { existsSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { BenchSection } from './api';
import { writeScene } from '../reference/fixtures/kick-scene';
import { LONG_STEM } from '../reference/fixtures/long-stem';
import { scoreOnsets } from '../reference/onset-scoring';
import { detectKickFile } from '../../server/audio/kick-detection';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');

interface Timed {
  wallSec: number;
  /** User + system CPU seconds: steadier than wall time on a shared machine. */
  cpuSec: number;
  peakRssMb: number;
  stdout: string;
}

/** Runs a command under GNU time -v; falls back to wall time only when /usr/bin/time is absent. */
function timed(cmd: string, args: string[]): Timed {
  const gnuTime = '/usr/bin/time';
  if (existsSync(gnuTime)) {
    const r = spawnSync(gnuTime, ['-v', cmd, ...args], { cwd: root, encoding: 'utf8', maxBuffer: 256 << 20 });
    if (r.status !== 0) throw new Error(`${cmd} failed: ${r.stderr.split('\n').slice(-5).join(' ')}`);
    const wall = /Elapsed \(wall clock\) time.*: (?:(\d+):)?(\d+):([\d.]+)/.exec(r.stderr);
    const rss = /Maximum resident set size \(kbytes\): (\d+)/.exec(r.stderr);
    const user = /User time \(seconds\): ([\d.]+)/.exec(r.stderr);
    const sys = /System time \(seconds\): ([\d.]+)/.exec(r.stderr);
    const cpuSec = user && sys ? Number(user[1]) + Number(sys[1]) : NaN;
    const wallSec = wall ? Number(wall[1] ?? 0) * 3600 + Number(wall[2]) * 60 + Number(wall[3]) : NaN;
    return { wallSec, cpuSec, peakRssMb: rss ? Number(rss[1]) / 1024 : NaN, stdout: r.stdout };
  }
  const t0 = performance.now();
  const r = spawnSync(cmd, args, { cwd: root, encoding: 'utf8', maxBuffer: 256 << 20 });
  return { wallSec: (performance.now() - t0) / 1000, cpuSec: NaN, peakRssMb: NaN, stdout: r.stdout };
}

/** Best (shortest wall time) of `n` runs, with the least CPU time and the largest RSS seen. */
function best(n: number, run: () => Timed): Timed {
  let out: Timed | null = null;
  let cpu = Infinity;
  let rss = 0;
  for (let i = 0; i < n; i++) {
    const r = run();
    cpu = Math.min(cpu, r.cpuSec);
    rss = Math.max(rss, r.peakRssMb);
    if (!out || r.wallSec < out.wallSec) out = r;
  }
  return { ...out!, cpuSec: cpu, peakRssMb: rss };
}

const fmtSec = (s: number): string => `${s.toFixed(2)} s`;
const fmtMb = (mb: number): string => (Number.isFinite(mb) ? `${mb.toFixed(0)} MB` : 'n/a');

export async function benchDetection(): Promise<BenchSection> {
  const stem = writeScene(LONG_STEM);
  const rows: BenchSection['rows'] = [];
  const truth = stem.onsetsSec;
  rows.push({ name: 'fixture', value: `${truth.length} hits`, note: '5 min, 48 kHz, stereo, 24-bit PCM (86 MB), punchy kick, 120 BPM, ±3 dB velocity' });

  const score = (times: number[]): string => {
    const s = scoreOnsets(truth, times, 0.005);
    return `F=${s.f.toFixed(3)}, median ${s.medianErrorMs.toFixed(2)} ms, p95 |e| ${s.p95AbsErrorMs.toFixed(2)} ms`;
  };

  let aubioEnergySec = NaN;
  for (const [label, args] of [
    ['aubioonset -O energy', ['-O', 'energy']],
    ['aubioonset -O hfc -H 128', ['-O', 'hfc', '-H', '128']],
  ] as const) {
    const r = best(5, () => timed('aubioonset', ['-i', stem.path, ...args]));
    if (args[1] === 'energy') aubioEnergySec = r.wallSec;
    const times = r.stdout.split('\n').map(Number).filter((t) => r.stdout.length > 0 && Number.isFinite(t) && t > 0);
    rows.push({ name: `${label}: time`, value: fmtSec(r.wallSec), note: `CPU ${fmtSec(r.cpuSec)}; peak RSS ${fmtMb(r.peakRssMb)}; best of 5` });
    rows.push({ name: `${label}: accuracy ±5 ms`, value: score(times) });
  }

  const bundle = join(root, 'dist/cli/tuckline.mjs');
  // Built afresh, so the figures are for the sources as they are.
  spawnSync('node', ['scripts/build-cli.mjs'], { cwd: root });
  if (existsSync(bundle)) {
    const parse = (stdout: string): number[] => (JSON.parse(stdout) as { hits: { timeSec: number }[] }).hits.map((h) => h.timeSec);
    const direct = best(5, () => timed('node', [bundle, 'detect', stem.path]));
    rows.push({ name: 'tuckline detect (node dist/cli/tuckline.mjs): time', value: fmtSec(direct.wallSec), note: `CPU ${fmtSec(direct.cpuSec)}; peak RSS ${fmtMb(direct.peakRssMb)} (limit 500 MB); best of 5` });
    const twoThreads = best(5, () => timed('node', [bundle, 'detect', stem.path, '--threads', '2']));
    rows.push({ name: 'tuckline detect --threads 2 (node dist/cli/tuckline.mjs): time', value: fmtSec(twoThreads.wallSec), note: `CPU ${fmtSec(twoThreads.cpuSec)}; peak RSS ${fmtMb(twoThreads.peakRssMb)}; best of 5; same hits (test/reference/detection-split.test.ts)` });
    const viaNpm = best(5, () => timed('npm', ['run', '-s', 'tuckline', '--', 'detect', stem.path]));
    rows.push({ name: 'tuckline detect (npm run -s tuckline -- detect): time', value: fmtSec(viaNpm.wallSec), note: `CPU ${fmtSec(viaNpm.cpuSec)} (npm included); peak RSS ${fmtMb(viaNpm.peakRssMb)} (largest process); best of 5` });
    const npmAlone = best(5, () => timed('npm', ['run', '-s', 'tuckline', '--', '--help']));
    rows.push({ name: 'npm run -s tuckline -- --help (start-up alone)', value: fmtSec(npmAlone.wallSec), note: 'npm, the launcher and the bundle, no audio; best of 5' });
    rows.push({ name: 'ratio: npm run -s tuckline -- detect / aubioonset -O energy', value: (viaNpm.wallSec / aubioEnergySec).toFixed(2), note: 'budget ≤ 1.0 (same file, same run)' });
    rows.push({ name: 'tuckline detect: accuracy ±5 ms', value: score(parse(direct.stdout)) });
  } else {
    rows.push({ name: 'tuckline detect (CLI)', value: 'not run', note: 'dist/cli/tuckline.mjs missing and could not be built; in-process figure below' });
  }

  await detectKickFile(stem.path, { threads: 1 }); // warm the JIT
  const t0 = performance.now();
  const inProcess = await detectKickFile(stem.path, { threads: 1 });
  const inSec = (performance.now() - t0) / 1000;
  rows.push({ name: 'detectKickFile in-process, one thread (decode + detect)', value: fmtSec(inSec), note: `${inProcess.hits.length} hits; warm process, tsx` });
  return { title: 'Kick detection', rows };
}

import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { statSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { writeScene } from './fixtures/kick-scene';
import { LONG_STEM } from './fixtures/long-stem';
import { scoreOnsets } from './onset-scoring';

const root = fileURLToPath(new URL('../..', import.meta.url));

/**
 * The memory bar: a 5-minute 48 kHz stereo 24-bit kick stem (86 MB)
 * analysed with peak RSS under 500 MB for the whole process (decoding it whole
 * with wav-decoder takes ~690 MB; TOOLCHAIN.md). Measured in a fresh Node
 * process from /proc/self/status VmHWM (the kernel's peak resident set).
 */
describe('memory: the 5-minute stem in one process', () => {
  for (const threads of [1, 2] as const) it(`detectKickFile on ${threads} thread(s) peaks under 500 MB resident and still finds all 600 hits`, () => {
    const stem = writeScene(LONG_STEM);
    expect(statSync(stem.path).size).toBeGreaterThan(86e6);
    const script = `
      import { readFileSync } from 'node:fs';
      import { detectKickFile } from './server/audio/kick-detection.ts';
      const r = await detectKickFile(${JSON.stringify(stem.path)}, { threads: ${threads} });
      const hwm = /VmHWM:\\s+(\\d+) kB/.exec(readFileSync('/proc/self/status', 'utf8'));
      console.log(JSON.stringify({ hwmMb: Number(hwm[1]) / 1024, times: r.hits.map((h) => h.timeSec) }));
    `;
    const out = execFileSync('node', ['--import', 'tsx', '--input-type=module', '-e', script], { cwd: root, encoding: 'utf8', maxBuffer: 64 << 20 });
    const { hwmMb, times } = JSON.parse(out.trim().split('\n').pop()!) as { hwmMb: number; times: number[] };
    expect(hwmMb).toBeLessThan(500);
    const score = scoreOnsets(stem.onsetsSec, times, 0.005);
    expect(score.f).toBe(1);
  });
});

import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { renderDemoStems } from '../../server/seed/demo-stems';

// The `report` command as users run it (`npm run -s tuckline -- report …`), checked against
// independent tools on the same kick + bass sum: sox mixes it (`-m` with `-v 1` on each input,
// REFERENCES.md: otherwise sox divides each by the input count) and reads its peak; ffmpeg's
// ebur128 meter reads its loudness and true peak (REFERENCES.md "Reference tool").
for (const tool of ['sox', 'ffmpeg']) {
  if (spawnSync('which', [tool]).status !== 0) throw new Error(`${tool} is missing: apt-get install -y ${tool}`);
}

const root = resolve(import.meta.dirname, '../..');
const dir = mkdtempSync(join(tmpdir(), 'tuckline-cli-report-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function run(args: string[]) {
  // Run from the folder holding the files, as a user would; npm finds the project with --prefix.
  return spawnSync('npm', ['--prefix', root, 'run', '-s', 'tuckline', '--', ...args], { cwd: dir, encoding: 'utf8' });
}

describe('tuckline report', () => {
  const stems = renderDemoStems({ bpm: 120, bars: 8 });
  let result: { hits: number; before: Record<string, number>; after: Record<string, number>; headroomGainedDb: number };

  beforeAll(() => {
    writeFileSync(join(dir, 'kick.wav'), stems.kickWav);
    writeFileSync(join(dir, 'bass.wav'), stems.bassWav);
    writeFileSync(join(dir, 'shape.json'), JSON.stringify({ points: [{ tMs: -3, gainDb: 0 }, { tMs: 0, gainDb: -40 }, { tMs: 50, gainDb: -40 }, { tMs: 150, gainDb: 0 }], slopeGuardMs: 5 }));
    const res = run(['report', 'kick.wav', '--bass', 'bass.wav', '--shape', 'shape.json']);
    expect(res.status, res.stderr).toBe(0);
    result = JSON.parse(res.stdout);
  });

  it('prints the contract: hits, before, after, headroomGainedDb', () => {
    expect(Object.keys(result)).toEqual(['hits', 'before', 'after', 'headroomGainedDb']);
    expect(Object.keys(result.before)).toEqual(['samplePeakDbfs', 'truePeakDbtp', 'integratedLufs']);
    expect(Object.keys(result.after)).toEqual(['samplePeakDbfs', 'truePeakDbtp', 'integratedLufs']);
    expect(result.hits).toBe(stems.kickTimesSec.length);
    expect(result.headroomGainedDb).toBeCloseTo(result.before.samplePeakDbfs - result.after.samplePeakDbfs, 1);
    expect(result.headroomGainedDb).toBeGreaterThan(0);
  });

  it('reads the untucked sum as sox and ffmpeg do (peak within 0.05 dB, I within 0.1 LU, true peak within 0.3 dB)', () => {
    const sum = join(dir, 'sum.wav');
    // The bass is mono and the kick stereo: Tuckline adds a mono stem to both channels, so sox does the same first.
    const bassStereo = join(dir, 'bass-stereo.wav');
    expect(spawnSync('sox', [join(dir, 'bass.wav'), '-b', '32', '-e', 'floating-point', bassStereo, 'remix', '1', '1']).status).toBe(0);
    const mix = spawnSync('sox', ['-m', '-v', '1', join(dir, 'kick.wav'), '-v', '1', bassStereo, '-b', '32', '-e', 'floating-point', sum], { encoding: 'utf8' });
    expect(mix.status, mix.stderr).toBe(0);
    const stat = spawnSync('sox', [sum, '-n', 'stat'], { encoding: 'utf8' });
    const maxAmp = Number(/Maximum amplitude:\s+([-\d.]+)/.exec(stat.stderr)?.[1]);
    const minAmp = Number(/Minimum amplitude:\s+([-\d.]+)/.exec(stat.stderr)?.[1]);
    const soxPeakDb = 20 * Math.log10(Math.max(Math.abs(maxAmp), Math.abs(minAmp)));
    expect(Math.abs(result.before.samplePeakDbfs - soxPeakDb)).toBeLessThan(0.05);
    const meter = spawnSync('ffmpeg', ['-nostats', '-hide_banner', '-i', sum, '-af', 'ebur128=peak=true', '-f', 'null', '-'], { encoding: 'utf8' });
    const summary = meter.stderr.slice(meter.stderr.lastIndexOf('Summary:'));
    const lufs = Number(/I:\s+(-?[\d.]+)\s+LUFS/.exec(summary)?.[1]);
    const tp = Number(/True peak:\s+Peak:\s+(-?[\d.]+)\s+dBFS/.exec(summary)?.[1]);
    expect(Math.abs(result.before.integratedLufs - lufs)).toBeLessThanOrEqual(0.1);
    expect(Math.abs(result.before.truePeakDbtp - tp)).toBeLessThanOrEqual(0.3);
  });

  it('refuses a missing --bass with exit 2 and one line on stderr', () => {
    const res = run(['report', 'kick.wav', '--shape', 'shape.json']);
    expect(res.status).toBe(2);
    expect(res.stderr.trim().split('\n')).toHaveLength(1);
    expect(res.stderr).toMatch(/--bass/);
  });

  it('refuses a kick that is not audio with exit 1', () => {
    writeFileSync(join(dir, 'not.wav'), 'hello');
    const res = run(['report', 'not.wav', '--bass', 'bass.wav', '--shape', 'shape.json']);
    expect(res.status).toBe(1);
    expect(res.stderr).not.toMatch(/\n\s+at /);
  });
});

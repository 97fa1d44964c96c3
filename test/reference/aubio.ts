import { execFileSync, spawnSync } from 'node:child_process';

/**
 * Runs Debian's aubioonset (aubio-tools) on a file; onset times in seconds
 * (REFERENCES.md "Onsets — A peer to compare with"). Throws with the install
 * command when the tool is missing, so the comparison can never be skipped.
 */
export function aubioOnsets(path: string, args: string[] = ['-O', 'energy']): number[] {
  const probe = spawnSync('aubioonset', ['--help'], { encoding: 'utf8' });
  if (probe.error) throw new Error('aubioonset is missing: apt-get install -y aubio-tools');
  const out = execFileSync('aubioonset', ['-i', path, ...args], { encoding: 'utf8', maxBuffer: 64 << 20 });
  return out
    .split('\n')
    .map((l) => l.trim())
    .filter((l) => l.length > 0)
    .map(Number)
    .filter((t) => Number.isFinite(t));
}

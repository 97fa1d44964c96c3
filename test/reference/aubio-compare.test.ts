import { describe, expect, it } from 'vitest';
import { detectKickFile } from '../../server/audio/kick-detection';
import { aubioOnsets } from './aubio';
import { ONSET_CASES } from './fixtures/onset-cases';
import { writeScene } from './fixtures/kick-scene';
import { scoreOnsets } from './onset-scoring';

/**
 * Tuckline against a peer: Debian's aubioonset (REFERENCES.md "Onsets — A
 * peer to compare with": `-O energy`, and `-O hfc -H 128`, the two methods
 * that reach F = 1.0 at ±5 ms on a kick stem). On the same files, our F at
 * ±5 ms must be ≥ aubio's and our median |error| ≤ aubio's. aubio-tools is
 * required: the helper fails, naming `apt-get install -y aubio-tools`.
 */
const METHODS: Array<{ name: string; args: string[] }> = [
  { name: 'energy', args: ['-O', 'energy'] },
  { name: 'hfc -H 128', args: ['-O', 'hfc', '-H', '128'] },
];

describe('Tuckline vs aubioonset on the same synthetic stems', () => {
  for (const scene of ONSET_CASES) {
    it(`${scene.name}: F(±5 ms) ≥ aubio's and median |error| ≤ aubio's, for energy and hfc`, async () => {
      const truth = writeScene(scene);
      const ours = scoreOnsets(truth.onsetsSec, (await detectKickFile(truth.path)).hits.map((h) => h.timeSec), 0.005);
      for (const m of METHODS) {
        const theirs = scoreOnsets(truth.onsetsSec, aubioOnsets(truth.path, m.args), 0.005);
        expect(ours.f, `F vs aubio ${m.name} (${theirs.f.toFixed(3)})`).toBeGreaterThanOrEqual(theirs.f);
        // aubio matching nothing has no median; ours must still be finite then.
        if (Number.isFinite(theirs.medianAbsErrorMs)) expect(ours.medianAbsErrorMs).toBeLessThanOrEqual(theirs.medianAbsErrorMs);
        else expect(Number.isFinite(ours.medianAbsErrorMs)).toBe(true);
      }
    });
  }
});

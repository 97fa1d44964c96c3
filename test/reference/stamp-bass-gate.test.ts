/**
 * Requirement 1, the bass gate across layers: a bass stem made by sox (an
 * independent writer) with a silent gap, its 5 ms peaks read by
 * server/audio/bass-activity.ts, stamped by the engine. Hits whose whole tuck
 * window falls in the gap get no tuck; a hit whose window touches sound keeps
 * its tuck (known by construction: the gate asks "silent over the whole window").
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { bassActivityFromFile } from '../../server/audio/bass-activity';
import { stampForLane } from '../../server/engine/engine.service';
import { gainDbAt } from '../../shared/dsp/gain';
import { buildTuckTemplate } from '../../shared/dsp/slope-guard';
import { tuckShapeSchema } from '../../shared/schemas/tuck-shape';

const shape = { points: [{ tMs: -3, gainDb: 0 }, { tMs: 0, gainDb: -40 }, { tMs: 50, gainDb: -40 }, { tMs: 150, gainDb: 0 }], slopeGuardMs: 5 };

describe('bass gate on a real stem', () => {
  it('skips exactly the hits whose tuck window lies in the silent gap (2.0–3.0 s)', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'tuckline-gate-'));
    const bass = join(dir, 'bass.wav');
    // 2 s of a 45 Hz sine at −6 dBFS, 1 s of digital silence, 1 s of sine again.
    const tone = (name: string, sec: number) => {
      execFileSync('sox', ['-n', '-r', '48000', '-b', '24', '-c', '2', join(dir, name), 'synth', String(sec), 'sine', '45', 'gain', '-6']);
      return join(dir, name);
    };
    const silence = join(dir, 'silence.wav');
    execFileSync('sox', ['-n', '-r', '48000', '-b', '24', '-c', '2', silence, 'trim', '0', '1']);
    execFileSync('sox', [tone('a.wav', 2), silence, tone('b.wav', 1), bass]);

    const tpl = buildTuckTemplate(tuckShapeSchema.parse(shape));
    // Tuck window: −10 ms … +150 ms around the hit.
    expect(tpl.startMs).toBeLessThan(-9);
    expect(tpl.endMs).toBe(150);
    const times = [1.0, 1.995, 2.05, 2.5, 2.84, 2.9, 3.5];
    // In the gap entirely: 2.05 (window 2.040–2.200), 2.5, 2.84 (… 2.990). 1.995 starts in sound; 2.9 ends in sound.
    const hits = times.map((timeSec) => ({ timeSec, strength: 1, enabled: true }));
    const activity = await bassActivityFromFile(bass);
    const { curve, gatedHitIndexes, stampedHitCount } = stampForLane(hits, { shape, gate: { enabled: true, thresholdDbfs: -50 } }, { durationSec: 4, bassActivity: activity });
    expect(gatedHitIndexes).toEqual([2, 3, 4]);
    expect(stampedHitCount).toBe(4);
    expect(gainDbAt(curve, 2.52)).toBe(0);
    expect(gainDbAt(curve, 1.0)).toBeCloseTo(-40, 9);
    expect(gainDbAt(curve, 2.9)).toBeCloseTo(-40, 9);
    // Gate off: every hit tucked.
    const all = stampForLane(hits, { shape, gate: { enabled: false, thresholdDbfs: -50 } }, { durationSec: 4, bassActivity: activity });
    expect(all.gatedHitIndexes).toEqual([]);
    expect(all.stampedHitCount).toBe(7);
  });
});

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoPassword } from '../../server/seed/demo-scenario';
import { renderDemoStems } from '../../server/seed/demo-stems';
import { seedDemo } from '../../server/seed/seed-demo';
import { createTestContext, expectErrorShape, signIn, type Agent, type TestContext } from '../helpers/test-app';

let ctx: TestContext;
let engineer: Agent;
let base: string;
const stems = renderDemoStems({ bpm: 96, bars: 4 });

beforeAll(async () => {
  ctx = await createTestContext();
  const teamId = (await seedDemo(ctx.db)).teamId;
  engineer = (await signIn(ctx, 'engineer@tuckline.test', demoPassword)).agent;
  const song = await engineer.post(`/api/teams/${teamId}/songs`).send({ title: 'Salt Flats', bpm: 96 });
  base = `/api/teams/${teamId}/songs/${song.body.id}`;
});
afterAll(async () => ctx.close());

describe('headroom report', () => {
  it('asks for a lane first (422)', async () => {
    await engineer.post(`${base}/stems`).field('role', 'kick').attach('file', Buffer.from(stems.kickWav), 'kick.wav').expect(201);
    const res = await engineer.get(`${base}/report`);
    expect(res.status).toBe(422);
    expectErrorShape(res.body, 'report.no_lanes');
  });

  it('measures kick plus bass before and after the tucks, and the headroom gained', async () => {
    await engineer.post(`${base}/stems`).field('role', 'bass').field('slot', 'sub').attach('file', Buffer.from(stems.bassWav), 'sub.wav').expect(201);
    await engineer.post(`${base}/lanes`).send({ name: 'Sub', bassSlot: 'sub' }).expect(201);
    const res = await engineer.get(`${base}/report`);
    expect(res.status).toBe(200);
    const r = res.body;
    // The synthetic kick body and the sub start together in phase, so their peaks add (REFERENCES.md "Summing")
    // and tucking the sub must take peak level off the sum (known by construction).
    expect(r.sum.before.samplePeakDbfs).toBeGreaterThan(r.sum.after.samplePeakDbfs);
    expect(r.headroomGainedDb.samplePeak).toBeGreaterThan(1);
    expect(r.headroomGainedDb.truePeak).toBeGreaterThan(1);
    // True peak is never below sample peak (BS.1770-4 Annex 2: oversampling only adds points).
    expect(r.sum.before.truePeakDbtp).toBeGreaterThanOrEqual(r.sum.before.samplePeakDbfs - 1e-9);
    // Tucks only remove bass energy: loudness after ≤ before.
    expect(r.sum.after.integratedLufs).toBeLessThanOrEqual(r.sum.before.integratedLufs);
    expect(r.lanes).toHaveLength(1);
    expect(r.perHit).toHaveLength(stems.kickTimesSec.length);
    const lowered = r.perHit.filter((h: { beforeDbfs: number; afterDbfs: number }) => h.afterDbfs < h.beforeDbfs - 0.5).length;
    expect(lowered).toBe(stems.kickTimesSec.length);
    expect(r.phase.hits).toHaveLength(stems.kickTimesSec.length);
    for (const h of r.phase.hits as { correlation: number; sumVsLouderDb: number }[]) {
      expect(h.correlation).toBeGreaterThanOrEqual(-1);
      expect(h.correlation).toBeLessThanOrEqual(1);
      // Two parts can at most add +6.02 dB over the louder (REFERENCES.md "Summing").
      expect(h.sumVsLouderDb).toBeLessThanOrEqual(6.03);
    }
  });

  it('prints a one-page HTML summary with the same figures', async () => {
    const json = (await engineer.get(`${base}/report`)).body;
    const page = await engineer.get(`${base}/report/printable`);
    expect(page.status).toBe(200);
    expect(page.headers['content-type']).toMatch(/text\/html/);
    expect(page.text).toContain('Headroom report — Salt Flats');
    expect(page.text).toContain(`${json.headroomGainedDb.samplePeak.toFixed(1)} dB`);
    expect(page.text).not.toMatch(/<script/i);
  });
});

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { presetFileFormat, presetFileVersion } from '../../shared/schemas/preset';
import { starterPresets } from '../../server/presets/starter-presets';
import { demoPassword } from '../../server/seed/demo-scenario';
import { seedDemo } from '../../server/seed/seed-demo';
import { createTestContext, expectErrorShape, signIn, signUp, type Agent, type TestContext } from '../helpers/test-app';

let ctx: TestContext;
let teamId: string;
let owner: Agent;
let engineer: Agent;
let assistant: Agent;
let outsider: Agent;
let base: string;

const shape = { points: [{ tMs: -2, gainDb: 0, curve: 'smooth' }, { tMs: 0, gainDb: -14 }, { tMs: 30, gainDb: -14, curve: 'smooth' }, { tMs: 110, gainDb: 0 }], slopeGuardMs: 5 };

beforeAll(async () => {
  ctx = await createTestContext();
  teamId = (await seedDemo(ctx.db)).teamId;
  owner = (await signIn(ctx, 'owner@tuckline.test', demoPassword)).agent;
  engineer = (await signIn(ctx, 'engineer@tuckline.test', demoPassword)).agent;
  assistant = (await signIn(ctx, 'assistant@tuckline.test', demoPassword)).agent;
  outsider = (await signUp(ctx, { email: 'ivo.rask@example.test' })).agent;
  base = `/api/teams/${teamId}/presets`;
});
afterAll(async () => ctx.close());

describe('starter presets', () => {
  it('are seeded, published, into every new team', async () => {
    const { session, agent } = await signUp(ctx, { email: 'new.team@example.test', teamName: 'Fresh Room' });
    const list = await agent.get(`/api/teams/${session.teams[0].id}/presets?sort=genre`);
    expect(list.status).toBe(200);
    expect(list.body).toHaveLength(starterPresets.length);
    expect(new Set(list.body.map((p: { genre: string }) => p.genre))).toEqual(new Set(['trap', 'drill', 'rnb', 'reggaeton', 'afrobeats', 'boom-bap', 'pop']));
    expect(list.body.every((p: { status: string }) => p.status === 'published')).toBe(true);
  });
});

describe('role matrix', () => {
  let draftId: string;
  it('lets engineers and owners create; assistants get 403', async () => {
    const made = await engineer.post(base).send({ name: 'Night tuck', genre: 'trap', shape });
    expect(made.status).toBe(201);
    expect(made.body).toMatchObject({ status: 'draft', version: 1, author: { displayName: 'Kofi Brandt' } });
    draftId = made.body.id;
    expect((await owner.post(base).send({ name: 'Owner tuck', genre: 'pop', shape })).status).toBe(201);
    const denied = await assistant.post(base).send({ name: 'Sneaky', genre: 'pop', shape });
    expect(denied.status).toBe(403);
    expectErrorShape(denied.body, 'auth.forbidden');
  });

  it('forbids assistants every editing route (403) and hides drafts from them (404)', async () => {
    const routes: [string, string, object?][] = [
      ['patch', `${base}/${draftId}`, { version: 1, name: 'x' }],
      ['post', `${base}/${draftId}/publish`],
      ['post', `${base}/${draftId}/retire`],
      ['post', `${base}/${draftId}/duplicate`],
      ['post', `${base}/${draftId}/versions/1/restore`, { version: 1 }],
      ['post', `${base}/import`, { format: presetFileFormat, formatVersion: presetFileVersion, presets: [{ name: 'a', genre: 'pop', shape }] }],
    ];
    for (const [method, path, payload] of routes) {
      const res = await (assistant as unknown as Record<string, (p: string) => { send(b?: object): Promise<{ status: number }> }>)[method](path).send(payload);
      expect(res.status, `${method} ${path}`).toBe(403);
    }
    expect((await assistant.get(`${base}/${draftId}`)).status).toBe(404);
    const names = (await assistant.get(base)).body.map((p: { name: string }) => p.name);
    expect(names).not.toContain('Night tuck');
    expect(names).toContain('Trap 808 tuck');
  });

  it('answers 404 to another team', async () => {
    expect((await outsider.get(`${base}/${draftId}`)).status).toBe(404);
    expect((await outsider.get(base)).status).toBe(404);
  });

  it('keeps one name per team and genre (409)', async () => {
    const dup = await engineer.post(base).send({ name: 'Night tuck', genre: 'trap', shape });
    expect(dup.status).toBe(409);
    expectErrorShape(dup.body, 'presets.name_taken');
  });

  it('filters by genre, searches name and notes, sorts', async () => {
    const trap = (await engineer.get(`${base}?genre=trap`)).body.map((p: { name: string }) => p.name);
    expect(trap.sort()).toEqual(['Night tuck', 'Trap 808 tuck']);
    const found = (await engineer.get(`${base}?q=pitch`)).body.map((p: { name: string }) => p.name);
    expect(found).toEqual(['Drill slide keeper']); // its notes mention pitch movement
  });
});

describe('versions and conflicts', () => {
  let id: string;
  it('saves each change as a new version with who and when', async () => {
    id = (await engineer.post(base).send({ name: 'Versioned', genre: 'drill', shape })).body.id;
    const v2 = await engineer.patch(`${base}/${id}`).send({ version: 1, notes: 'deeper' , shape: { ...shape, depthDb: -20 } });
    expect(v2.status).toBe(200);
    expect(v2.body.version).toBe(2);
    const v3 = await owner.patch(`${base}/${id}`).send({ version: 2, name: 'Versioned deep' });
    expect(v3.body.version).toBe(3);
    const versions = (await engineer.get(`${base}/${id}/versions`)).body as { version: number; savedBy: { displayName: string }; content: { name: string; shape: { depthDb: number | null } } }[];
    expect(versions.map((v) => [v.version, v.savedBy.displayName, v.content.name])).toEqual([
      [3, 'Odile Marsh', 'Versioned deep'],
      [2, 'Kofi Brandt', 'Versioned'],
      [1, 'Kofi Brandt', 'Versioned'],
    ]);
    expect(versions[1].content.shape.depthDb).toBe(-20);
  });

  it('gives the second of two saves from the same version 409, and keeps the first', async () => {
    const first = await engineer.patch(`${base}/${id}`).send({ version: 3, notes: 'Kofi was here' });
    expect(first.status).toBe(200);
    const second = await owner.patch(`${base}/${id}`).send({ version: 3, notes: 'Odile was here' });
    expect(second.status).toBe(409);
    expectErrorShape(second.body, 'presets.stale');
    expect(second.body.error.details).toEqual({ currentVersion: 4 });
    expect((await engineer.get(`${base}/${id}`)).body.notes).toBe('Kofi was here');
  });

  it('restores an old version as a new one', async () => {
    const restored = await engineer.post(`${base}/${id}/versions/1/restore`).send({ version: 4 });
    expect(restored.status).toBe(200);
    expect(restored.body).toMatchObject({ version: 5, name: 'Versioned', notes: '' });
    expect(restored.body.shape.depthDb).toBeNull();
  });

  it('publishes, retires and duplicates', async () => {
    expect((await engineer.post(`${base}/${id}/publish`)).body.status).toBe('published');
    const copy = await engineer.post(`${base}/${id}/duplicate`);
    expect(copy.status).toBe(201);
    expect(copy.body).toMatchObject({ name: 'Versioned (copy)', status: 'draft', version: 1 });
    expect((await engineer.post(`${base}/${id}/retire`)).body.status).toBe('retired');
    expect((await engineer.get(base)).body.map((p: { id: string }) => p.id)).not.toContain(id);
    expect((await engineer.get(`${base}?status=retired`)).body.map((p: { id: string }) => p.id)).toEqual([id]);
  });

  it('records preset changes in the audit trail', async () => {
    const trail = await owner.get(`/api/teams/${teamId}/audit?action=preset.`);
    expect(trail.status).toBe(200);
    const actions = trail.body.items.map((e: { action: string }) => e.action);
    expect(actions).toEqual(expect.arrayContaining(['preset.created', 'preset.saved', 'preset.restored', 'preset.published', 'preset.retired', 'preset.duplicated']));
    expect((await engineer.get(`/api/teams/${teamId}/audit`)).status).toBe(403);
  });
});

describe('import and export', () => {
  it('exports a preset as a file that imports back as a draft copy', async () => {
    const list = (await engineer.get(`${base}?genre=rnb`)).body as { id: string }[];
    const file = await engineer.get(`${base}/${list[0].id}/export`);
    expect(file.status).toBe(200);
    expect(file.headers['content-disposition']).toMatch(/rnb_r-b-soft-pocket\.tuckline-presets\.json/);
    expect(file.body).toMatchObject({ format: presetFileFormat, formatVersion: 1 });
    file.body.presets[0].name = 'R&B soft pocket (from file)';
    const imported = await engineer.post(`${base}/import`).send(file.body);
    expect(imported.status).toBe(201);
    expect(imported.body[0]).toMatchObject({ name: 'R&B soft pocket (from file)', status: 'draft', genre: 'rnb' });
  });

  const count = async () => (await ctx.db.$client.query('select count(*)::int n from presets')).rows[0].n as number;
  it.each([
    ['an unknown format version', { format: presetFileFormat, formatVersion: 99, presets: [{ name: 'x', genre: 'pop', shape }] }, 400],
    ['another format', { format: 'something-else', formatVersion: 1, presets: [] }, 400],
    ['wrong types', { format: presetFileFormat, formatVersion: 1, presets: [{ name: 42, genre: ['pop'], shape: 'deep' }] }, 400],
    ['absurd values', { format: presetFileFormat, formatVersion: 1, presets: [{ name: 'Loud', genre: 'pop', shape: { points: [{ tMs: 0, gainDb: 40 }, { tMs: 10, gainDb: -1e9 }] } }] }, 400],
    ['points out of order', { format: presetFileFormat, formatVersion: 1, presets: [{ name: 'Back', genre: 'pop', shape: { points: [{ tMs: 10, gainDb: 0 }, { tMs: 0, gainDb: -6 }] } }] }, 400],
    ['a huge point array', { format: presetFileFormat, formatVersion: 1, presets: [{ name: 'Big', genre: 'pop', shape: { points: Array.from({ length: 5000 }, (_, i) => ({ tMs: i * 0.1, gainDb: -1 })) } }] }, 400],
    ['too many presets', { format: presetFileFormat, formatVersion: 1, presets: Array.from({ length: 201 }, (_, i) => ({ name: `p${i}`, genre: 'pop', shape })) }, 400],
  ])('refuses %s with %s and changes nothing', async (_what, payload, status) => {
    const before = await count();
    const res = await engineer.post(`${base}/import`).send(payload);
    expect(res.status).toBe(status);
    expect(typeof res.body.error.message).toBe('string');
    expect(await count()).toBe(before);
  });

  it('refuses a file whose second preset clashes, importing none of it', async () => {
    const before = await count();
    const res = await engineer.post(`${base}/import`).send({ format: presetFileFormat, formatVersion: 1, presets: [{ name: 'Fine one', genre: 'pop', shape }, { name: 'Trap 808 tuck', genre: 'trap', shape }] });
    expect(res.status).toBe(409);
    expect(await count()).toBe(before);
  });

  it('refuses a body that is not JSON, and one over the size limit', async () => {
    expect((await engineer.post(`${base}/import`).set('content-type', 'application/json').send('{"format":')).status).toBe(400);
    const huge = JSON.stringify({ format: presetFileFormat, formatVersion: 1, presets: [{ name: 'x'.repeat(2_000_000), genre: 'pop', shape }] });
    expect((await engineer.post(`${base}/import`).set('content-type', 'application/json').send(huge)).status).toBe(413);
  });
});

describe('presets on lanes', () => {
  it('applies a published preset to a lane (assistants too), says when a newer version exists, and saves a lane as a preset', async () => {
    const song = await engineer.post(`/api/teams/${teamId}/songs`).send({ title: 'Glass Pier', bpm: 128 });
    const lanesBase = `/api/teams/${teamId}/songs/${song.body.id}/lanes`;
    const lane = await engineer.post(lanesBase).send({ name: 'Sub' });
    const trap = (await assistant.get(`${base}?genre=trap`)).body.find((p: { name: string }) => p.name === 'Trap 808 tuck');
    const applied = await assistant.post(`${lanesBase}/${lane.body.id}/apply-preset`).send({ presetId: trap.id });
    expect(applied.status).toBe(200);
    expect(applied.body).toMatchObject({ presetId: trap.id, presetVersion: 1, presetLatestVersion: 1, presetName: 'Trap 808 tuck' });
    expect(applied.body.shape.points).toEqual(trap.shape.points);
    await engineer.patch(`${base}/${trap.id}`).send({ version: 1, notes: 'tweaked' });
    const after = await assistant.get(`${lanesBase}/${lane.body.id}`);
    expect(after.body).toMatchObject({ presetVersion: 1, presetLatestVersion: 2 });
    expect((await engineer.get(`${base}/${trap.id}`)).body.useCount).toBe(1);
    // An assistant cannot apply a draft.
    const draft = (await engineer.post(base).send({ name: 'Not yet', genre: 'pop', shape })).body;
    expect((await assistant.post(`${lanesBase}/${lane.body.id}/apply-preset`).send({ presetId: draft.id })).status).toBe(422);
    const saved = await engineer.post(`${base}/from-lane`).send({ songId: song.body.id, laneId: lane.body.id, name: 'Glass Pier sub', genre: 'trap' });
    expect(saved.status).toBe(201);
    expect(saved.body.shape.points).toEqual(trap.shape.points);
    expect((await assistant.post(`${base}/from-lane`).send({ songId: song.body.id, laneId: lane.body.id, name: 'Nope', genre: 'trap' })).status).toBe(403);
  });
});

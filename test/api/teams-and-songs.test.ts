import supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoPassword } from '../../server/seed/demo-scenario';
import { seedDemo } from '../../server/seed/seed-demo';
import { createTestContext, expectErrorShape, signIn, signUp, type Agent, type TestContext } from '../helpers/test-app';

let ctx: TestContext;
let teamId: string;
let owner: Agent;
let engineer: Agent;
let assistant: Agent;
let outsider: Agent;
let outsiderTeamId: string;

beforeAll(async () => {
  ctx = await createTestContext();
  teamId = (await seedDemo(ctx.db)).teamId;
  owner = (await signIn(ctx, 'owner@tuckline.test', demoPassword)).agent;
  engineer = (await signIn(ctx, 'engineer@tuckline.test', demoPassword)).agent;
  assistant = (await signIn(ctx, 'assistant@tuckline.test', demoPassword)).agent;
  const other = await signUp(ctx, { email: 'juno.vale@example.test', teamName: 'Vale Tracking Co.' });
  outsider = other.agent;
  outsiderTeamId = other.session.teams[0].id;
});
afterAll(async () => ctx.close());

describe('demo seed', () => {
  it('is idempotent: a second run adds nothing', async () => {
    const count = async () => (await ctx.db.$client.query('select (select count(*) from users)::int u, (select count(*) from songs)::int s, (select count(*) from teams)::int t')).rows[0];
    const before = await count();
    const again = await seedDemo(ctx.db);
    expect(again).toEqual({ teamId, created: false });
    expect(await count()).toEqual(before);
  });
});

describe('songs', () => {
  it('lists the team\'s songs with sort, filter and paging', async () => {
    const all = await engineer.get(`/api/teams/${teamId}/songs?sort=title&order=asc`);
    expect(all.status).toBe(200);
    expect(all.body.total).toBe(3);
    expect(all.body.items.map((s: { title: string }) => s.title)).toEqual(['Copper Rain', 'Night Ferry', 'Sundial Riddim']);
    const filtered = await engineer.get(`/api/teams/${teamId}/songs?q=ferry`);
    expect(filtered.body.items.map((s: { title: string }) => s.title)).toEqual(['Night Ferry']);
    const page = await engineer.get(`/api/teams/${teamId}/songs?sort=bpm&order=desc&page=1&pageSize=2`);
    expect(page.body.total).toBe(3);
    expect(page.body.items.map((s: { bpm: number }) => s.bpm)).toEqual([92]);
  });

  it('treats % and _ in the filter as plain characters', async () => {
    const res = await engineer.get(`/api/teams/${teamId}/songs?q=${encodeURIComponent('%')}`);
    expect(res.body.total).toBe(0);
  });

  it('creates, reads, updates and deletes a song', async () => {
    const created = await assistant
      .post(`/api/teams/${teamId}/songs`)
      .send({ title: 'Harbour Lights', artistAlias: 'Dune Choir', bpm: 104, timeSignature: { beats: 6, beatUnit: 8 } });
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({ title: 'Harbour Lights', bpm: 104, timeSignature: { beats: 6, beatUnit: 8 }, notes: '', stemCount: 0, hitCount: null });
    expect(created.body.createdBy.displayName).toBe('Pia Lindqvist');
    const id = created.body.id;
    const patched = await engineer.patch(`/api/teams/${teamId}/songs/${id}`).send({ bpm: 105.5 });
    expect(patched.body).toMatchObject({ bpm: 105.5, artistAlias: 'Dune Choir', timeSignature: { beats: 6, beatUnit: 8 } });
    // An assistant prepares songs but may not delete them (glossary: roles).
    const denied = await assistant.delete(`/api/teams/${teamId}/songs/${id}`);
    expect(denied.status).toBe(403);
    expectErrorShape(denied.body, 'auth.forbidden');
    expect((await engineer.delete(`/api/teams/${teamId}/songs/${id}`)).status).toBe(204);
    const gone = await engineer.get(`/api/teams/${teamId}/songs/${id}`);
    expect(gone.status).toBe(404);
    expectErrorShape(gone.body, 'songs.not_found');
  });

  it('validates the song body with the shared schema (400 with issues)', async () => {
    const res = await engineer.post(`/api/teams/${teamId}/songs`).send({ title: '', bpm: 'fast', timeSignature: { beats: 4, beatUnit: 3 } });
    expect(res.status).toBe(400);
    expectErrorShape(res.body, 'request.invalid');
    const paths = (res.body.error.details as { path: string }[]).map((d) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['title', 'bpm', 'timeSignature.beatUnit']));
  });

  it('rejects a bad list query with 400', async () => {
    const res = await engineer.get(`/api/teams/${teamId}/songs?pageSize=100000`);
    expect(res.status).toBe(400);
  });
});

describe('isolation between teams', () => {
  it('answers 404 to a member of another team for the song, the team and its members', async () => {
    const list = await engineer.get(`/api/teams/${teamId}/songs`);
    const songId = list.body.items[0].id;
    const song = await outsider.get(`/api/teams/${teamId}/songs/${songId}`);
    expect(song.status).toBe(404);
    expectErrorShape(song.body, 'teams.not_found');
    expect((await outsider.get(`/api/teams/${teamId}`)).status).toBe(404);
    expect((await outsider.get(`/api/teams/${teamId}/members`)).status).toBe(404);
    expect((await outsider.patch(`/api/teams/${teamId}/songs/${songId}`).send({ title: 'Mine now' })).status).toBe(404);
  });

  it('answers 404 when a song id of one team is used under another team', async () => {
    const list = await engineer.get(`/api/teams/${teamId}/songs`);
    const songId = list.body.items[0].id;
    const res = await outsider.get(`/api/teams/${outsiderTeamId}/songs/${songId}`);
    expect(res.status).toBe(404);
    expectErrorShape(res.body, 'songs.not_found');
  });

  it('answers 404 for malformed ids rather than a server error', async () => {
    expect((await engineer.get(`/api/teams/not-a-uuid/songs`)).status).toBe(404);
    expect((await engineer.get(`/api/teams/${teamId}/songs/not-a-uuid`)).status).toBe(404);
  });

  it('answers 401 without a session', async () => {
    const res = await supertest(ctx.app).get(`/api/teams/${teamId}/songs`);
    expect(res.status).toBe(401);
    expectErrorShape(res.body, 'auth.required');
  });
});

describe('members and roles', () => {
  it('lets any member read the member list', async () => {
    const res = await assistant.get(`/api/teams/${teamId}/members`);
    expect(res.status).toBe(200);
    expect(res.body.map((m: { role: string }) => m.role).sort()).toEqual(['assistant', 'engineer', 'owner']);
  });

  it('forbids assistants and engineers from managing members (403)', async () => {
    const members = (await owner.get(`/api/teams/${teamId}/members`)).body as { userId: string; role: string }[];
    const eng = members.find((m) => m.role === 'engineer')!;
    for (const agent of [assistant, engineer]) {
      const change = await agent.patch(`/api/teams/${teamId}/members/${eng.userId}`).send({ role: 'owner' });
      expect(change.status).toBe(403);
      expectErrorShape(change.body, 'auth.forbidden');
      expect((await agent.delete(`/api/teams/${teamId}/members/${eng.userId}`)).status).toBe(403);
      expect((await agent.patch(`/api/teams/${teamId}`).send({ name: 'Taken over' })).status).toBe(403);
    }
  });

  it('lets the owner change a role, and never removes the last owner', async () => {
    const members = (await owner.get(`/api/teams/${teamId}/members`)).body as { userId: string; role: string }[];
    const asst = members.find((m) => m.role === 'assistant')!;
    const own = members.find((m) => m.role === 'owner')!;
    const promoted = await owner.patch(`/api/teams/${teamId}/members/${asst.userId}`).send({ role: 'engineer' });
    expect(promoted.status).toBe(200);
    expect(promoted.body.role).toBe('engineer');
    await owner.patch(`/api/teams/${teamId}/members/${asst.userId}`).send({ role: 'assistant' }).expect(200);
    const demoteSelf = await owner.patch(`/api/teams/${teamId}/members/${own.userId}`).send({ role: 'engineer' });
    expect(demoteSelf.status).toBe(409);
    expectErrorShape(demoteSelf.body, 'members.last_owner');
    const removeSelf = await owner.delete(`/api/teams/${teamId}/members/${own.userId}`);
    expect(removeSelf.status).toBe(409);
    const badRole = await owner.patch(`/api/teams/${teamId}/members/${asst.userId}`).send({ role: 'producer' });
    expect(badRole.status).toBe(400);
  });

  it('records role changes in the audit trail', async () => {
    const { rows } = await ctx.db.$client.query("select action, details from audit_events where team_id = $1 and action = 'member.role_changed' order by created_at", [teamId]);
    expect(rows.map((r) => r.details)).toEqual([
      { from: 'assistant', to: 'engineer' },
      { from: 'engineer', to: 'assistant' },
    ]);
  });

  it('lets a person belong to several teams', async () => {
    const created = await engineer.post('/api/teams').send({ name: 'Kofi Side Projects' });
    expect(created.status).toBe(201);
    const teams = (await engineer.get('/api/teams')).body as { name: string; role: string }[];
    expect(teams).toEqual(
      expect.arrayContaining([
        { id: expect.any(String), name: 'Saltmarsh Sound Room', role: 'engineer' },
        { id: expect.any(String), name: 'Kofi Side Projects', role: 'owner' },
      ]),
    );
  });
});

describe('unknown routes', () => {
  it('answer 404 in the error shape', async () => {
    const res = await supertest(ctx.app).get('/api/nothing-here');
    expect(res.status).toBe(404);
    expectErrorShape(res.body, 'request.no_route');
  });
});

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

/** The link in a caught message's text (the fake SMTP server received it over real SMTP). */
function linkIn(text: string, path: string): string {
  const match = new RegExp(`https?://[^\\s]+/${path}/([A-Za-z0-9_-]+)`).exec(text);
  if (!match) throw new Error(`no /${path}/ link in: ${text}`);
  return match[1];
}

beforeAll(async () => {
  ctx = await createTestContext();
  teamId = (await seedDemo(ctx.db)).teamId;
  owner = (await signIn(ctx, 'owner@tuckline.test', demoPassword)).agent;
  engineer = (await signIn(ctx, 'engineer@tuckline.test', demoPassword)).agent;
  assistant = (await signIn(ctx, 'assistant@tuckline.test', demoPassword)).agent;
});
afterAll(async () => ctx.close());

describe('invitations', () => {
  it('owner invites; the e-mail arrives through SMTP; the link creates the account and works once', async () => {
    const delivered = ctx.mail.waitFor('lena.moor@example.test');
    const invite = await owner.post(`/api/teams/${teamId}/invitations`).send({ email: 'Lena.Moor@example.test', role: 'assistant' });
    expect(invite.status).toBe(201);
    expect(invite.body).toMatchObject({ email: 'lena.moor@example.test', role: 'assistant', status: 'pending', invitedBy: { displayName: 'Odile Marsh' } });
    const days = (Date.parse(invite.body.expiresAt) - Date.now()) / 86_400_000;
    expect(days).toBeGreaterThan(6.9);
    expect(days).toBeLessThanOrEqual(7);
    const message = await delivered;
    expect(message.subject).toBe('Join Saltmarsh Sound Room on Tuckline');
    const token = linkIn(message.text, 'invitations');

    const preview = await supertest(ctx.app).get(`/api/invitations/${token}`);
    expect(preview.body).toMatchObject({ teamName: 'Saltmarsh Sound Room', role: 'assistant', accountExists: false });

    const agent = supertest.agent(ctx.app);
    const accepted = await agent.post(`/api/invitations/${token}/accept`).send({ displayName: 'Lena Moor', password: 'harbour-lights-77' });
    expect(accepted.status).toBe(200);
    expect(accepted.body.teams).toEqual([{ id: teamId, name: 'Saltmarsh Sound Room', role: 'assistant' }]);
    expect((await agent.get(`/api/teams/${teamId}/songs`)).status).toBe(200);

    const again = await supertest(ctx.app).post(`/api/invitations/${token}/accept`).send({ displayName: 'Lena Again', password: 'harbour-lights-77' });
    expect(again.status).toBe(404);
    expectErrorShape(again.body, 'invitations.invalid');
  });

  it('adds a membership to an existing account that proves it is theirs', async () => {
    const { agent: juno } = await signUp(ctx, { email: 'juno.hale@example.test', password: 'juno-password-1' });
    const delivered = ctx.mail.waitFor('juno.hale@example.test');
    await owner.post(`/api/teams/${teamId}/invitations`).send({ email: 'juno.hale@example.test', role: 'engineer' }).expect(201);
    const token = linkIn((await delivered).text, 'invitations');
    const stranger = await supertest(ctx.app).post(`/api/invitations/${token}/accept`).send({ password: 'a-wrong-guess-123' });
    expect(stranger.status).toBe(401);
    const ok = await juno.post(`/api/invitations/${token}/accept`).send({});
    expect(ok.status).toBe(200);
    expect(ok.body.teams.map((t: { role: string }) => t.role).sort()).toEqual(['engineer', 'owner']);
  });

  it('refuses an expired link', async () => {
    const delivered = ctx.mail.waitFor('late.comer@example.test');
    const invite = await owner.post(`/api/teams/${teamId}/invitations`).send({ email: 'late.comer@example.test', role: 'assistant' });
    const token = linkIn((await delivered).text, 'invitations');
    await ctx.db.$client.query("update invitations set expires_at = now() - interval '1 minute' where id = $1", [invite.body.id]);
    const res = await supertest(ctx.app).post(`/api/invitations/${token}/accept`).send({ displayName: 'Late', password: 'late-password-1' });
    expect(res.status).toBe(400);
    expectErrorShape(res.body, 'invitations.expired');
    expect((await ctx.db.$client.query("select count(*)::int n from users where email = 'late.comer@example.test'")).rows[0].n).toBe(0);
  });

  it('resends with a new link (the old one stops working) and revokes', async () => {
    const first = ctx.mail.waitFor('re.send@example.test');
    const invite = await owner.post(`/api/teams/${teamId}/invitations`).send({ email: 're.send@example.test', role: 'engineer' });
    const oldToken = linkIn((await first).text, 'invitations');
    const dup = await owner.post(`/api/teams/${teamId}/invitations`).send({ email: 're.send@example.test', role: 'engineer' });
    expect(dup.status).toBe(409);
    const second = ctx.mail.waitFor('re.send@example.test');
    expect((await owner.post(`/api/teams/${teamId}/invitations/${invite.body.id}/resend`)).status).toBe(200);
    const newToken = linkIn((await second).text, 'invitations');
    expect(newToken).not.toBe(oldToken);
    expect((await supertest(ctx.app).get(`/api/invitations/${oldToken}`)).status).toBe(404);
    expect((await owner.delete(`/api/teams/${teamId}/invitations/${invite.body.id}`)).status).toBe(204);
    expect((await supertest(ctx.app).get(`/api/invitations/${newToken}`)).status).toBe(404);
    const pending = (await owner.get(`/api/teams/${teamId}/invitations`)).body.map((i: { email: string }) => i.email);
    expect(pending).not.toContain('re.send@example.test');
  });

  it('is for owners only (403), and refuses inviting a member (409)', async () => {
    for (const agent of [engineer, assistant]) {
      expect((await agent.post(`/api/teams/${teamId}/invitations`).send({ email: 'x@example.test', role: 'assistant' })).status).toBe(403);
      expect((await agent.get(`/api/teams/${teamId}/invitations`)).status).toBe(403);
    }
    const member = await owner.post(`/api/teams/${teamId}/invitations`).send({ email: 'engineer@tuckline.test', role: 'owner' });
    expect(member.status).toBe(409);
    expectErrorShape(member.body, 'invitations.already_member');
  });

  it('is in the audit trail, which owners can filter', async () => {
    const sent = await owner.get(`/api/teams/${teamId}/audit?action=invitation.sent`);
    expect(sent.body.items.map((e: { details: { email: string } }) => e.details.email)).toEqual(
      expect.arrayContaining(['lena.moor@example.test', 'juno.hale@example.test', 'late.comer@example.test', 're.send@example.test']),
    );
    expect(sent.body.items.every((e: { action: string }) => e.action === 'invitation.sent')).toBe(true);
    const signIns = await owner.get(`/api/teams/${teamId}/audit?action=auth.sign_in`);
    expect(signIns.body.total).toBeGreaterThanOrEqual(3);
  });
});

describe('password reset', () => {
  it('mails a single-use link that sets a new password', async () => {
    const delivered = ctx.mail.waitFor('assistant@tuckline.test');
    const res = await supertest(ctx.app).post('/api/auth/password-reset').send({ email: 'assistant@tuckline.test' });
    expect(res.status).toBe(202);
    const token = linkIn((await delivered).text, 'reset-password');
    const done = await supertest(ctx.app).post('/api/auth/password-reset/confirm').send({ token, password: 'a-brand-new-pass' });
    expect(done.status).toBe(200);
    await signIn(ctx, 'assistant@tuckline.test', 'a-brand-new-pass');
    const reuse = await supertest(ctx.app).post('/api/auth/password-reset/confirm').send({ token, password: 'another-new-pass' });
    expect(reuse.status).toBe(400);
    expectErrorShape(reuse.body, 'auth.reset_invalid');
  });

  it('gives no hint whether the address exists', async () => {
    const known = await supertest(ctx.app).post('/api/auth/password-reset').send({ email: 'engineer@tuckline.test' });
    const unknown = await supertest(ctx.app).post('/api/auth/password-reset').send({ email: 'nobody.here@example.test' });
    expect(unknown.status).toBe(known.status);
    expect(unknown.body).toEqual(known.body);
    await new Promise((r) => setTimeout(r, 300));
    expect(ctx.mail.messages().some((m) => m.to.includes('nobody.here@example.test'))).toBe(false);
  });

  it('refuses an expired link', async () => {
    const delivered = ctx.mail.waitFor('owner@tuckline.test');
    await supertest(ctx.app).post('/api/auth/password-reset').send({ email: 'owner@tuckline.test' });
    const token = linkIn((await delivered).text, 'reset-password');
    await ctx.db.$client.query("update password_resets set expires_at = now() - interval '1 second' where used_at is null");
    const res = await supertest(ctx.app).post('/api/auth/password-reset/confirm').send({ token, password: 'too-late-password' });
    expect(res.status).toBe(400);
    expectErrorShape(res.body, 'auth.reset_expired');
    await signIn(ctx, 'owner@tuckline.test', demoPassword);
  });

  it('is rate-limited per address (429)', async () => {
    const limited = await createTestContext({ resetLimit: 2 });
    try {
      const statuses = [];
      for (let i = 0; i < 4; i++) statuses.push((await supertest(limited.app).post('/api/auth/password-reset').send({ email: 'someone@example.test' })).status);
      expect(statuses).toEqual([202, 202, 429, 429]);
    } finally {
      await limited.close();
    }
  });
});

describe('team settings', () => {
  it('owners change the defaults; others read them', async () => {
    const trap = (await engineer.get(`/api/teams/${teamId}/presets?genre=trap`)).body[0];
    const saved = await owner.patch(`/api/teams/${teamId}/settings`).send({ defaultExport: { cc: 7, ppq: 480 }, defaultPresetByGenre: { trap: trap.id } });
    expect(saved.status).toBe(200);
    expect(saved.body).toMatchObject({ name: 'Saltmarsh Sound Room', defaultExport: { cc: 7, channel: 1, ppq: 480, fourteenBit: false }, defaultPresetByGenre: { trap: trap.id } });
    expect((await assistant.get(`/api/teams/${teamId}/settings`)).body.defaultExport.cc).toBe(7);
    expect((await engineer.patch(`/api/teams/${teamId}/settings`).send({ defaultExport: { cc: 1 } })).status).toBe(403);
    expect((await owner.patch(`/api/teams/${teamId}/settings`).send({ defaultExport: { cc: 300 } })).status).toBe(400);
  });
});

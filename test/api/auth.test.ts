import jwt from 'jsonwebtoken';
import supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sessionCookie } from '../../server/auth/session-token';
import { createTestContext, expectErrorShape, signUp, type TestContext } from '../helpers/test-app';

let ctx: TestContext;
beforeAll(async () => {
  ctx = await createTestContext();
});
afterAll(async () => ctx.close());

describe('sign-up', () => {
  it('creates the account, its own team as owner, and a session cookie', async () => {
    const res = await supertest(ctx.app)
      .post('/api/auth/sign-up')
      .send({ email: 'Rhea.Quill@Example.test', password: 'lowend-lantern-9', displayName: 'Rhea Quill', teamName: 'Quill Mix Room' });
    expect(res.status).toBe(201);
    expect(res.body.user.email).toBe('rhea.quill@example.test');
    expect(res.body.teams).toEqual([{ id: expect.any(String), name: 'Quill Mix Room', role: 'owner' }]);
    const cookie = String(res.headers['set-cookie']);
    expect(cookie).toContain(`${sessionCookie}=`);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    expect(res.body).not.toHaveProperty('user.passwordHash');
  });

  it('stores a bcrypt hash of cost 10 or more, never the password', async () => {
    const { rows } = await ctx.db.$client.query("select password_hash from users where email = 'rhea.quill@example.test'");
    const hash: string = rows[0].password_hash;
    expect(hash).not.toContain('lowend-lantern-9');
    // bcrypt's modular crypt format: $2a$/$2b$ then a two-digit cost (Provos & Mazières, 1999).
    const cost = Number(/^\$2[aby]\$(\d\d)\$/.exec(hash)?.[1]);
    expect(cost).toBeGreaterThanOrEqual(10);
  });

  it('refuses a taken e-mail with 409', async () => {
    const res = await supertest(ctx.app)
      .post('/api/auth/sign-up')
      .send({ email: 'rhea.quill@example.test', password: 'another-password-1', displayName: 'Impostor' });
    expect(res.status).toBe(409);
    expectErrorShape(res.body, 'auth.email_taken');
  });

  it('refuses a short password and a bad e-mail with 400 and the issues', async () => {
    const res = await supertest(ctx.app).post('/api/auth/sign-up').send({ email: 'not-an-email', password: 'short', displayName: '' });
    expect(res.status).toBe(400);
    expectErrorShape(res.body, 'request.invalid');
    const paths = (res.body.error.details as { path: string }[]).map((d) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['email', 'password', 'displayName']));
  });

  it('answers 400 for a body that is not JSON', async () => {
    const res = await supertest(ctx.app).post('/api/auth/sign-up').set('content-type', 'application/json').send('{"email":');
    expect(res.status).toBe(400);
    expectErrorShape(res.body, 'request.malformed_json');
  });

  it('answers 413 for an oversized body', async () => {
    const res = await supertest(ctx.app)
      .post('/api/auth/sign-up')
      .set('content-type', 'application/json')
      .send(JSON.stringify({ email: 'big@example.test', password: 'x'.repeat(2 * 1024 * 1024), displayName: 'Big' }));
    expect(res.status).toBe(413);
    expectErrorShape(res.body, 'request.too_large');
  });
});

describe('sign-in and sign-out', () => {
  it('signs in with the right password and reads the session back', async () => {
    const agent = supertest.agent(ctx.app);
    const res = await agent.post('/api/auth/sign-in').send({ email: 'rhea.quill@example.test', password: 'lowend-lantern-9' });
    expect(res.status).toBe(200);
    const me = await agent.get('/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body.user.displayName).toBe('Rhea Quill');
  });

  it('gives the same 401 for an unknown e-mail and a wrong password (no user enumeration)', async () => {
    const wrong = await supertest(ctx.app).post('/api/auth/sign-in').send({ email: 'rhea.quill@example.test', password: 'not-her-password' });
    const unknown = await supertest(ctx.app).post('/api/auth/sign-in').send({ email: 'nobody@example.test', password: 'not-her-password' });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body).toEqual(unknown.body);
    expectErrorShape(wrong.body, 'auth.invalid_credentials');
  });

  it('signs out by clearing the cookie', async () => {
    const agent = supertest.agent(ctx.app);
    await agent.post('/api/auth/sign-in').send({ email: 'rhea.quill@example.test', password: 'lowend-lantern-9' }).expect(200);
    const out = await agent.post('/api/auth/sign-out');
    expect(out.status).toBe(204);
    expect(String(out.headers['set-cookie'])).toMatch(new RegExp(`${sessionCookie}=;`));
    const me = await agent.get('/api/auth/me');
    expect(me.status).toBe(401);
    expectErrorShape(me.body, 'auth.required');
  });
});

describe('tokens', () => {
  async function userId() {
    const { rows } = await ctx.db.$client.query("select id from users where email = 'rhea.quill@example.test'");
    return rows[0].id as string;
  }

  it('refuses an expired token with 401', async () => {
    const token = jwt.sign({ exp: Math.floor(Date.now() / 1000) - 60 }, ctx.config.jwtSecret, { algorithm: 'HS256', subject: await userId() });
    const res = await supertest(ctx.app).get('/api/auth/me').set('Cookie', `${sessionCookie}=${token}`);
    expect(res.status).toBe(401);
    expectErrorShape(res.body, 'auth.invalid_session');
  });

  it('refuses a token signed with another secret', async () => {
    const token = jwt.sign({}, 'someone-elses-secret-that-is-long-enough', { algorithm: 'HS256', subject: await userId(), expiresIn: '1h' });
    const res = await supertest(ctx.app).get('/api/auth/me').set('Cookie', `${sessionCookie}=${token}`);
    expect(res.status).toBe(401);
  });

  it('refuses an unsigned ("alg": "none") token', async () => {
    const header = Buffer.from(JSON.stringify({ alg: 'none', typ: 'JWT' })).toString('base64url');
    const payload = Buffer.from(JSON.stringify({ sub: await userId(), exp: Math.floor(Date.now() / 1000) + 3600 })).toString('base64url');
    const res = await supertest(ctx.app).get('/api/auth/me').set('Cookie', `${sessionCookie}=${header}.${payload}.`);
    expect(res.status).toBe(401);
  });

  it('refuses a tampered payload', async () => {
    const token = jwt.sign({}, ctx.config.jwtSecret, { algorithm: 'HS256', subject: await userId(), expiresIn: '1h' });
    const [h, , s] = token.split('.');
    const forged = Buffer.from(JSON.stringify({ sub: '00000000-0000-4000-8000-000000000000', exp: 9999999999 })).toString('base64url');
    const res = await supertest(ctx.app).get('/api/auth/me').set('Cookie', `${sessionCookie}=${h}.${forged}.${s}`);
    expect(res.status).toBe(401);
  });
});

describe('rate limit on sign-in', () => {
  it('answers 429 after too many attempts for one address and e-mail', async () => {
    const limited = await createTestContext({ signInLimit: 3 });
    try {
      await signUp(limited, { email: 'target@example.test' });
      const statuses: number[] = [];
      for (let i = 0; i < 5; i++) {
        const res = await supertest(limited.app).post('/api/auth/sign-in').send({ email: 'target@example.test', password: 'wrong-guess-' + i });
        statuses.push(res.status);
      }
      expect(statuses).toEqual([401, 401, 401, 429, 429]);
    } finally {
      await limited.close();
    }
  });
});

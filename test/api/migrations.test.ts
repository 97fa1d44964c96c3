import { randomUUID } from 'node:crypto';
import { readdirSync } from 'node:fs';
import { afterAll, describe, expect, it } from 'vitest';
import { inject } from 'vitest';
import { createDatabase, type Database } from '../../server/db/client';
import { ensureDatabase } from '../../server/db/cluster';
import { migrateDatabase, migrationsFolder } from '../../server/db/migrate';

let db: Database | undefined;
afterAll(async () => db?.$client.end());

describe('migrations', () => {
  it('migrate an empty database from scratch, then again without change', async () => {
    const name = `empty_${randomUUID().replaceAll('-', '')}`;
    const port = inject('pgPort');
    await ensureDatabase(port, name);
    db = createDatabase(`postgres://app@127.0.0.1:${port}/${name}`);
    await migrateDatabase(db);
    const tables = (await db.$client.query("select table_name from information_schema.tables where table_schema = 'public' order by 1")).rows.map((r) => r.table_name);
    expect(tables).toEqual(
      expect.arrayContaining(['users', 'teams', 'memberships', 'songs', 'stems', 'hit_maps', 'hits', 'lanes', 'presets', 'preset_versions', 'exports', 'invitations', 'audit_events', 'password_resets']),
    );
    const applied = (await db.$client.query('select count(*)::int n from drizzle.__drizzle_migrations')).rows[0].n;
    expect(applied).toBe(readdirSync(migrationsFolder).filter((f) => f.endsWith('.sql')).length);
    await migrateDatabase(db);
    expect((await db.$client.query('select count(*)::int n from drizzle.__drizzle_migrations')).rows[0].n).toBe(applied);
  });

  it('enforce one membership per person and team, and one preset name per team and genre', async () => {
    const c = db!.$client;
    const team = (await c.query("insert into teams (name) values ('Unique Co') returning id")).rows[0].id;
    const user = (await c.query("insert into users (email, display_name, password_hash) values ('u@example.test', 'U', 'x') returning id")).rows[0].id;
    await c.query("insert into memberships (team_id, user_id, role) values ($1, $2, 'owner')", [team, user]);
    await expect(c.query("insert into memberships (team_id, user_id, role) values ($1, $2, 'engineer')", [team, user])).rejects.toMatchObject({ code: '23505' });
    await c.query("insert into presets (team_id, genre, name) values ($1, 'trap', 'Tight 808')", [team]);
    await expect(c.query("insert into presets (team_id, genre, name) values ($1, 'trap', 'Tight 808')", [team])).rejects.toMatchObject({ code: '23505' });
    await c.query("insert into presets (team_id, genre, name) values ($1, 'drill', 'Tight 808')", [team]);
  });
});

import { and, asc, count, eq } from 'drizzle-orm';
import type { z } from 'zod';
import { teamSettingsSchema, type teamSettingsPatchSchema } from '../../shared/schemas/invitation';
import type { Role } from '../../shared/schemas/team';
import type { Database, Executor } from '../db/client';
import { isUniqueViolation } from '../db/pg-errors';
import { conflict, notFound } from '../http/errors';
import { insertStarterPresets } from '../presets/presets.repository';
import { users } from '../users/users.table';
import { memberships, teams } from './teams.table';

export function createTeamsRepository(db: Database) {
  return {
    async teamsOf(userId: string) {
      return db
        .select({ id: teams.id, name: teams.name, role: memberships.role })
        .from(memberships)
        .innerJoin(teams, eq(teams.id, memberships.teamId))
        .where(eq(memberships.userId, userId))
        .orderBy(asc(teams.name));
    },
    async membership(teamId: string, userId: string) {
      const [row] = await db
        .select({ id: teams.id, name: teams.name, role: memberships.role })
        .from(memberships)
        .innerJoin(teams, eq(teams.id, memberships.teamId))
        .where(and(eq(memberships.teamId, teamId), eq(memberships.userId, userId)));
      return row;
    },
    /** A new team with its owner and the starter presets; pass a transaction so all of it lands or none. */
    async create(name: string, ownerId: string, tx?: Executor) {
      const run = async (t: Executor) => {
        const [team] = await t.insert(teams).values({ name }).returning();
        await t.insert(memberships).values({ teamId: team.id, userId: ownerId, role: 'owner' });
        await insertStarterPresets(t, team.id, ownerId);
        return { id: team.id, name: team.name, role: 'owner' as const };
      };
      return tx ? run(tx) : db.transaction(run);
    },
    async settings(teamId: string) {
      const [row] = await db.select({ name: teams.name, settings: teams.settings }).from(teams).where(eq(teams.id, teamId));
      return { name: row.name, ...teamSettingsSchema.parse(row.settings) };
    },
    async saveSettings(teamId: string, patch: z.output<typeof teamSettingsPatchSchema>) {
      return db.transaction(async (tx) => {
        const [row] = await tx.select({ settings: teams.settings }).from(teams).where(eq(teams.id, teamId)).for('update');
        const current = teamSettingsSchema.parse(row.settings);
        const byGenre = { ...current.defaultPresetByGenre };
        for (const [genre, id] of Object.entries(patch.defaultPresetByGenre ?? {})) {
          if (id) byGenre[genre] = id;
          else delete byGenre[genre];
        }
        const next = teamSettingsSchema.parse({ defaultExport: { ...current.defaultExport, ...patch.defaultExport }, defaultPresetByGenre: byGenre });
        await tx.update(teams).set({ settings: next, ...(patch.name ? { name: patch.name } : {}) }).where(eq(teams.id, teamId));
        const [after] = await tx.select({ name: teams.name }).from(teams).where(eq(teams.id, teamId));
        return { name: after.name, ...next };
      });
    },
    async rename(teamId: string, name: string) {
      await db.update(teams).set({ name }).where(eq(teams.id, teamId));
    },
    async addMember(teamId: string, userId: string, role: Role, tx: Executor = db) {
      try {
        await tx.insert(memberships).values({ teamId, userId, role });
      } catch (error) {
        if (isUniqueViolation(error)) throw conflict('members.already_member', 'That person is already in this team.');
        throw error;
      }
    },
    async members(teamId: string) {
      const rows = await db
        .select({
          userId: users.id,
          email: users.email,
          displayName: users.displayName,
          role: memberships.role,
          joinedAt: memberships.createdAt,
        })
        .from(memberships)
        .innerJoin(users, eq(users.id, memberships.userId))
        .where(eq(memberships.teamId, teamId))
        .orderBy(asc(users.displayName));
      return rows.map((r) => ({ ...r, joinedAt: r.joinedAt.toISOString() }));
    },
    /**
     * Changes a role or removes a member inside one transaction that locks the
     * team's owner rows, so two owners demoting each other cannot leave none.
     */
    async changeMember(teamId: string, userId: string, change: { role: Role } | 'remove') {
      return db.transaction(async (tx) => {
        const rows = await tx
          .select({ userId: memberships.userId, role: memberships.role })
          .from(memberships)
          .where(eq(memberships.teamId, teamId))
          .for('update');
        const target = rows.find((r) => r.userId === userId);
        if (!target) throw notFound('members.not_found', 'That person is not in this team.');
        const owners = rows.filter((r) => r.role === 'owner').length;
        const losesOwner = target.role === 'owner' && (change === 'remove' || change.role !== 'owner');
        if (losesOwner && owners <= 1) {
          throw conflict('members.last_owner', 'A team needs at least one owner. Make someone else an owner first.');
        }
        if (change === 'remove') {
          await tx.delete(memberships).where(and(eq(memberships.teamId, teamId), eq(memberships.userId, userId)));
        } else {
          await tx.update(memberships).set({ role: change.role }).where(and(eq(memberships.teamId, teamId), eq(memberships.userId, userId)));
        }
        return { previousRole: target.role };
      });
    },
    async countMembers(teamId: string) {
      const [row] = await db.select({ n: count() }).from(memberships).where(eq(memberships.teamId, teamId));
      return row.n;
    },
  };
}
export type TeamsRepository = ReturnType<typeof createTeamsRepository>;

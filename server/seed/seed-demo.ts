import { and, eq } from 'drizzle-orm';
import { hashPassword } from '../auth/passwords';
import type { Database } from '../db/client';
import { songs } from '../songs/songs.table';
import { memberships, teams } from '../teams/teams.table';
import { users } from '../users/users.table';
import { demoPassword, demoPeople, demoSongs, demoTeamName } from './demo-scenario';

export interface SeedResult {
  teamId: string;
  created: boolean;
}

/** Seeds the demo team once: a second run finds the owner and changes nothing. */
export async function seedDemo(db: Database): Promise<SeedResult> {
  const [existing] = await db
    .select({ teamId: memberships.teamId })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .innerJoin(teams, eq(teams.id, memberships.teamId))
    .where(and(eq(users.email, demoPeople[0].email), eq(teams.name, demoTeamName)));
  if (existing) return { teamId: existing.teamId, created: false };

  const passwordHash = await hashPassword(demoPassword);
  return db.transaction(async (tx) => {
    const [team] = await tx.insert(teams).values({ name: demoTeamName }).returning();
    const ids: string[] = [];
    for (const person of demoPeople) {
      const [found] = await tx.select().from(users).where(eq(users.email, person.email));
      const user = found ?? (await tx.insert(users).values({ email: person.email, displayName: person.displayName, passwordHash }).returning())[0];
      await tx.insert(memberships).values({ teamId: team.id, userId: user.id, role: person.role });
      ids.push(user.id);
    }
    for (const song of demoSongs) {
      await tx.insert(songs).values({
        teamId: team.id,
        title: song.title,
        artistAlias: song.artistAlias,
        bpm: song.bpm,
        timeSignatureBeats: song.timeSignature.beats,
        timeSignatureUnit: song.timeSignature.beatUnit,
        notes: song.notes,
        createdBy: ids[1],
      });
    }
    return { teamId: team.id, created: true };
  });
}

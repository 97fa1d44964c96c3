import { and, eq } from 'drizzle-orm';
import { hashPassword } from '../auth/passwords';
import { insertStarterPresets } from '../presets/presets.repository';
import type { Database } from '../db/client';
import { songs } from '../songs/songs.table';
import { memberships, teams } from '../teams/teams.table';
import { users } from '../users/users.table';
import { createHash } from 'node:crypto';
import { writeFile } from 'node:fs/promises';
import { createHitsRepository } from '../hits/hits.repository';
import { createHitsService } from '../hits/hits.service';
import { createLanesRepository } from '../lanes/lanes.repository';
import { createLanesService } from '../lanes/lanes.service';
import { createStemsRepository } from '../stems/stems.repository';
import { createStemsService } from '../stems/stems.service';
import type { FileStore } from '../storage/file-store';
import type { HashedFile } from '../storage/hashing-storage';
import { demoPassword, demoPeople, demoSongs, demoTeamName } from './demo-scenario';
import { renderDemoStems } from './demo-stems';
import { laneCreateSchema } from '../../shared/schemas/lane';

export interface SeedResult {
  teamId: string;
  created: boolean;
}

/**
 * Seeds the demo team once: a second run finds the owner and changes nothing.
 * With a file store, the first demo song also gets generated kick and 808
 * stems, its hit map and one lane, so the workspace has something to show.
 */
export async function seedDemo(db: Database, store?: FileStore): Promise<SeedResult> {
  const [existing] = await db
    .select({ teamId: memberships.teamId })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .innerJoin(teams, eq(teams.id, memberships.teamId))
    .where(and(eq(users.email, demoPeople[0].email), eq(teams.name, demoTeamName)));
  if (existing) return { teamId: existing.teamId, created: false };

  const passwordHash = await hashPassword(demoPassword);
  const seeded = await db.transaction(async (tx) => {
    const [team] = await tx.insert(teams).values({ name: demoTeamName }).returning();
    const ids: string[] = [];
    for (const person of demoPeople) {
      const [found] = await tx.select().from(users).where(eq(users.email, person.email));
      const user = found ?? (await tx.insert(users).values({ email: person.email, displayName: person.displayName, passwordHash }).returning())[0];
      await tx.insert(memberships).values({ teamId: team.id, userId: user.id, role: person.role });
      ids.push(user.id);
    }
    await insertStarterPresets(tx, team.id, ids[0]);
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
  if (store) await seedDemoStems(db, store, seeded.teamId);
  return seeded;
}

async function seedDemoStems(db: Database, store: FileStore, teamId: string): Promise<void> {
  const song = demoSongs[0];
  const [row] = await db.select().from(songs).where(and(eq(songs.teamId, teamId), eq(songs.title, song.title)));
  const [engineer] = await db.select().from(users).where(eq(users.email, demoPeople[1].email));
  const stemsRepo = createStemsRepository(db);
  const hits = createHitsService({ db, hits: createHitsRepository(db), stems: stemsRepo, store });
  const stems = createStemsService({ db, stems: stemsRepo, store, hits });
  const lanes = createLanesService({ lanes: createLanesRepository(db), hits, stems, stemsRepo });
  // 16 bars at the song's tempo; the 808 rests in bars 9 and 10 (a breakdown), so the bass gate has work to do.
  const rendered = renderDemoStems({ bpm: song.bpm, bars: 16, silentBassBars: [8, 9] });
  const upload = async (bytes: Uint8Array, name: string, role: 'kick' | 'bass', slot: string) => {
    const path = store.tempPath('.wav');
    await writeFile(path, bytes);
    const file = { path, size: bytes.byteLength, sha256: createHash('sha256').update(bytes).digest('hex'), originalname: name } as HashedFile;
    try {
      await stems.upload(row.id, engineer.id, file, { role, slot });
    } finally {
      await store.removeTemp(path);
    }
  };
  await upload(rendered.kickWav, 'NightFerry_Kick_v1.wav', 'kick', 'kick');
  await upload(rendered.bassWav, 'NightFerry_808_v1.wav', 'bass', '808');
  await lanes.create(row.id, laneCreateSchema.parse({ name: '808', bassSlot: '808' }));
}

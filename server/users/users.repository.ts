import { eq } from 'drizzle-orm';
import type { Database, Executor } from '../db/client';
import { conflict } from '../http/errors';
import { isUniqueViolation } from '../db/pg-errors';
import { users } from './users.table';

export type UserRow = typeof users.$inferSelect;

export function createUsersRepository(db: Database) {
  return {
    async findByEmail(email: string): Promise<UserRow | undefined> {
      const [row] = await db.select().from(users).where(eq(users.email, email));
      return row;
    },
    async findById(id: string): Promise<UserRow | undefined> {
      const [row] = await db.select().from(users).where(eq(users.id, id));
      return row;
    },
    async create(input: { email: string; displayName: string; passwordHash: string }, tx: Executor = db): Promise<UserRow> {
      try {
        const [row] = await tx.insert(users).values(input).returning();
        return row;
      } catch (error) {
        if (isUniqueViolation(error)) throw conflict('auth.email_taken', 'An account with that e-mail already exists. Sign in instead.');
        throw error;
      }
    },
    async touchSignIn(id: string): Promise<void> {
      await db.update(users).set({ lastSignInAt: new Date() }).where(eq(users.id, id));
    },
    async setPassword(id: string, passwordHash: string, tx: Executor = db): Promise<void> {
      await tx.update(users).set({ passwordHash }).where(eq(users.id, id));
    },
  };
}
export type UsersRepository = ReturnType<typeof createUsersRepository>;

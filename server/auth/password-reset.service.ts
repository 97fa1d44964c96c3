import { and, eq, gt, isNull } from 'drizzle-orm';
import type { Audit } from '../audit/audit.service';
import type { Database } from '../db/client';
import { badRequest } from '../http/errors';
import type { Mailer } from '../mail/mailer';
import { passwordResetMail } from '../mail/messages';
import { passwordResets } from '../users/users.table';
import type { UsersRepository } from '../users/users.repository';
import { hashOneTimeToken, newOneTimeToken } from './one-time-token';
import { hashPassword } from './passwords';

/** Reset links live one hour (OWASP Forgot Password Cheat Sheet: short-lived, single-use tokens). */
export const resetLifetimeMinutes = 60;

const invalidLink = () => badRequest('auth.reset_invalid', 'This reset link is not valid: it was already used or replaced. Ask for a new one.');

export function createPasswordResetService(deps: { db: Database; users: UsersRepository; mailer: Mailer; publicUrl: string; audit: Audit; now?: () => Date }) {
  const { db, users, mailer } = deps;
  const now = deps.now ?? (() => new Date());
  return {
    /** Always answers the same way; a message goes out only when the address has an account. */
    async request(email: string): Promise<void> {
      const user = await users.findByEmail(email);
      if (!user) return;
      const { token, hash } = newOneTimeToken();
      await db.transaction(async (tx) => {
        // A new link replaces any earlier one.
        await tx.update(passwordResets).set({ usedAt: now() }).where(and(eq(passwordResets.userId, user.id), isNull(passwordResets.usedAt)));
        await tx.insert(passwordResets).values({ userId: user.id, tokenHash: hash, expiresAt: new Date(now().getTime() + resetLifetimeMinutes * 60_000) });
      });
      await mailer.send(passwordResetMail({ to: user.email, link: `${deps.publicUrl}/reset-password/${token}`, minutes: resetLifetimeMinutes }));
    },

    async confirm(token: string, password: string): Promise<void> {
      const passwordHash = await hashPassword(password);
      await db.transaction(async (tx) => {
        const [row] = await tx.select().from(passwordResets).where(and(eq(passwordResets.tokenHash, hashOneTimeToken(token)), isNull(passwordResets.usedAt))).for('update');
        if (!row) throw invalidLink();
        if (row.expiresAt <= now()) throw badRequest('auth.reset_expired', 'This reset link has expired. Ask for a new one.');
        const [used] = await tx
          .update(passwordResets)
          .set({ usedAt: now() })
          .where(and(eq(passwordResets.id, row.id), isNull(passwordResets.usedAt), gt(passwordResets.expiresAt, now())))
          .returning();
        if (!used) throw invalidLink();
        await users.setPassword(row.userId, passwordHash, tx);
        await deps.audit.record({ actorId: row.userId, action: 'auth.password_reset' }, tx);
      });
    },
  };
}
export type PasswordResetService = ReturnType<typeof createPasswordResetService>;

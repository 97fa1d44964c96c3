import { pgTable, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { id, timestamps } from '../db/columns';

export const users = pgTable(
  'users',
  {
    ...id,
    email: text().notNull(),
    displayName: text().notNull(),
    passwordHash: text().notNull(),
    lastSignInAt: timestamp({ withTimezone: true }),
    ...timestamps,
  },
  (t) => [uniqueIndex('users_email_unique').on(t.email)],
);

/** Single-use password reset tokens (issue 5); only a hash of the token is stored. */
export const passwordResets = pgTable('password_resets', {
  ...id,
  userId: uuid()
    .notNull()
    .references(() => users.id, { onDelete: 'cascade' }),
  tokenHash: text().notNull().unique(),
  expiresAt: timestamp({ withTimezone: true }).notNull(),
  usedAt: timestamp({ withTimezone: true }),
  createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
});

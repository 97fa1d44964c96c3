import { timestamp, uuid } from 'drizzle-orm/pg-core';

/** Column groups spread into tables (Drizzle docs, "Reusable column groups"). */
export const id = { id: uuid().primaryKey().defaultRandom() };

export const timestamps = {
  createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp({ withTimezone: true })
    .notNull()
    .defaultNow()
    .$onUpdate(() => new Date()),
};

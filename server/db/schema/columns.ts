import { timestamp } from 'drizzle-orm/pg-core';

/** Every instant is stored with its time zone so that servers in different zones agree. */
export const instant = () => timestamp({ withTimezone: true });

/**
 * Shared bookkeeping columns. A function rather than one shared object, so that no column
 * builder is ever reused between tables.
 */
export const timestamps = () => ({
  createdAt: instant().defaultNow().notNull(),
  // $onUpdate runs in drizzle's update builder only; raw SQL updates must set it themselves.
  updatedAt: instant()
    .defaultNow()
    .notNull()
    .$onUpdate(() => new Date()),
});

/** SQL list literal for a CHECK constraint on a text column with a fixed set of values. */
export const sqlList = (values: readonly string[]): string => values.map((v) => `'${v}'`).join(', ');

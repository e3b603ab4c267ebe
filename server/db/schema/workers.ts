import { doublePrecision, integer, pgTable, text } from 'drizzle-orm/pg-core';
import { instant } from './columns.ts';

/**
 * Compute processes that have joined the pool (scale-out: `rollway worker`; embedded: the server's
 * own pool). Each writes a heartbeat; admins see host, concurrency, speed and last heartbeat.
 */
export const workers = pgTable('workers', {
  id: text().primaryKey(),
  host: text().notNull(),
  pid: integer().notNull(),
  concurrency: integer().notNull(),
  pointsDone: integer().notNull().default(0),
  pointsPerSecond: doublePrecision(),
  startedAt: instant().defaultNow().notNull(),
  lastHeartbeatAt: instant().defaultNow().notNull(),
  stoppedAt: instant(),
});

export type WorkerRow = typeof workers.$inferSelect;

import { sql } from 'drizzle-orm';
import { check, index, integer, pgTable, text, unique } from 'drizzle-orm/pg-core';
import { instant, sqlList } from './columns.ts';
import { scans } from './scans.ts';

export const BATCH_STATES = ['pending', 'running', 'done', 'failed'] as const;
export type BatchState = (typeof BATCH_STATES)[number];

/** A contiguous slice [firstIndex, firstIndex + pointCount) of a scan's point indices. */
export const batches = pgTable(
  'batches',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    scanId: integer()
      .notNull()
      .references(() => scans.id, { onDelete: 'cascade' }),
    firstIndex: integer().notNull(),
    pointCount: integer().notNull(),
    state: text({ enum: BATCH_STATES }).notNull().default('pending'),
    attempts: integer().notNull().default(0),
    workerId: text(),
    // A running batch whose lease has passed belongs to a dead worker and may be handed out again.
    leasedUntil: instant(),
    error: text(),
    startedAt: instant(),
    finishedAt: instant(),
  },
  (t) => [
    // Also serves as the index behind the foreign key (scan_id leads).
    unique('batches_scan_id_first_index_key').on(t.scanId, t.firstIndex),
    // The dispatcher's "next pending batch of any scan" query.
    index('batches_state_scan_id_idx').on(t.state, t.scanId),
    check('batches_state_check', sql.raw(`state in (${sqlList(BATCH_STATES)})`)),
  ],
);

export type Batch = typeof batches.$inferSelect;
export type NewBatch = typeof batches.$inferInsert;

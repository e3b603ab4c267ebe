import { sql } from 'drizzle-orm';
import { check, doublePrecision, index, integer, jsonb, pgTable, text } from 'drizzle-orm/pg-core';
import { groups, users } from './accounts.ts';
import { instant, sqlList, timestamps } from './columns.ts';

import { SCAN_STATES } from '../../../shared/api/scans.ts';

export { SCAN_STATES };
export type ScanState = (typeof SCAN_STATES)[number];

/**
 * The validated plan as the plan schema produced it. Typed loosely here because `shared/plan`
 * owns its shape; repositories narrow it with the plan schema when they read it back.
 */
export type StoredPlan = Record<string, unknown>;

export const scans = pgTable(
  'scans',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    title: text().notNull(),
    notes: text().notNull().default(''),
    plan: jsonb().$type<StoredPlan>().notNull(),
    // Verbatim as submitted (YAML or JSON, comments included), so a result traces to its source.
    planText: text().notNull(),
    planHash: text().notNull(),
    physicsVersion: text().notNull(),
    // Text + CHECK rather than a pg enum: adding a state later is a plain constraint swap,
    // with no ALTER TYPE (which PostgreSQL restricts inside transactions).
    state: text({ enum: SCAN_STATES }).notNull().default('queued'),
    pointCount: integer().notNull(),
    // Points with a stored result, failed ones included: the scan is complete when
    // pointsDone = pointCount. pointsFailed counts the subset whose status is not 'ok'.
    pointsDone: integer().notNull().default(0),
    pointsFailed: integer().notNull().default(0),
    computeSeconds: doublePrecision().notNull().default(0),
    error: text(),
    // Null only for scans stored before accounts existed; kept (unowned, admin-only) if the user goes.
    ownerId: integer().references(() => users.id, { onDelete: 'set null' }),
    // Re-run or extension of another scan: points with the same request are copied from it.
    basedOnScanId: integer(),
    groupId: integer().references(() => groups.id, { onDelete: 'set null' }),
    startedAt: instant(),
    finishedAt: instant(),
    ...timestamps(),
  },
  (t) => [
    index('scans_state_idx').on(t.state),
    index('scans_owner_id_idx').on(t.ownerId),
    index('scans_group_id_idx').on(t.groupId),
    check('scans_state_check', sql.raw(`state in (${sqlList(SCAN_STATES)})`)),
  ],
);

export type Scan = typeof scans.$inferSelect;
export type NewScan = typeof scans.$inferInsert;

import { sql } from 'drizzle-orm';
import { boolean, check, doublePrecision, index, integer, pgTable, primaryKey, text, unique } from 'drizzle-orm/pg-core';
import { ROLES, TOKEN_SCOPES } from '../../../shared/api/accounts.ts';
import { instant, sqlList, timestamps } from './columns.ts';

export type Role = (typeof ROLES)[number];

export const users = pgTable(
  'users',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    // Stored lower-cased, so the unique constraint is case-insensitive in effect.
    email: text().notNull(),
    name: text().notNull().default(''),
    role: text({ enum: ROLES }).notNull(),
    // Null until the user has set one (invited, or the first admin before set-up).
    passwordHash: text(),
    disabled: boolean().notNull().default(false),
    // Null: the server's default quota applies.
    monthlyPointQuota: integer(),
    maxRunningScans: integer(),
    ...timestamps(),
  },
  (t) => [unique('users_email_key').on(t.email), check('users_role_check', sql.raw(`role in (${sqlList(ROLES)})`))],
);

export const groups = pgTable('groups', {
  id: integer().primaryKey().generatedAlwaysAsIdentity(),
  name: text().notNull().unique('groups_name_key'),
  ...timestamps(),
});

export const groupMembers = pgTable(
  'group_members',
  {
    groupId: integer().notNull().references(() => groups.id, { onDelete: 'cascade' }),
    userId: integer().notNull().references(() => users.id, { onDelete: 'cascade' }),
    createdAt: instant().defaultNow().notNull(),
  },
  (t) => [primaryKey({ columns: [t.groupId, t.userId] }), index('group_members_user_id_idx').on(t.userId)],
);

/** One row per signed-in session; the JWT carries its id, so deleting or revoking the row ends it. */
export const sessions = pgTable(
  'sessions',
  {
    id: text().primaryKey(),
    userId: integer().notNull().references(() => users.id, { onDelete: 'cascade' }),
    expiresAt: instant().notNull(),
    revokedAt: instant(),
    createdAt: instant().defaultNow().notNull(),
    lastSeenAt: instant(),
  },
  (t) => [index('sessions_user_id_idx').on(t.userId)],
);

/** API tokens for scripts: only a SHA-256 of the secret is kept. */
export const apiTokens = pgTable(
  'api_tokens',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    userId: integer().notNull().references(() => users.id, { onDelete: 'cascade' }),
    name: text().notNull(),
    scopes: text().array().$type<(typeof TOKEN_SCOPES)[number][]>().notNull(),
    secretHash: text().notNull().unique('api_tokens_secret_hash_key'),
    // First characters of the secret, so a user can tell tokens apart in a list.
    prefix: text().notNull(),
    expiresAt: instant().notNull(),
    revokedAt: instant(),
    lastUsedAt: instant(),
    createdAt: instant().defaultNow().notNull(),
  },
  (t) => [index('api_tokens_user_id_idx').on(t.userId)],
);

export const LINK_PURPOSES = ['invitation', 'password_reset', 'setup'] as const;

/** Single-use links (invitation, password reset, first set-up): only a hash of the secret is kept. */
export const linkTokens = pgTable(
  'link_tokens',
  {
    id: integer().primaryKey().generatedAlwaysAsIdentity(),
    userId: integer().notNull().references(() => users.id, { onDelete: 'cascade' }),
    purpose: text({ enum: LINK_PURPOSES }).notNull(),
    secretHash: text().notNull().unique('link_tokens_secret_hash_key'),
    expiresAt: instant().notNull(),
    usedAt: instant(),
    createdAt: instant().defaultNow().notNull(),
  },
  (t) => [check('link_tokens_purpose_check', sql.raw(`purpose in (${sqlList(LINK_PURPOSES)})`))],
);

/**
 * What each scan charged its owner, by calendar month (UTC). Kept apart from scans, without a
 * foreign key, so deleting a scan does not give the quota back or erase the admin's usage figures.
 */
export const scanUsage = pgTable(
  'scan_usage',
  {
    scanId: integer().primaryKey(),
    userId: integer().notNull().references(() => users.id, { onDelete: 'cascade' }),
    month: text().notNull(),
    pointsCharged: integer().notNull(),
    pointsComputed: integer().notNull().default(0),
    computeSeconds: doublePrecision().notNull().default(0),
  },
  (t) => [index('scan_usage_user_month_idx').on(t.userId, t.month)],
);

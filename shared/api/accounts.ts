import { z } from 'zod';

/**
 * API types of accounts, sessions, groups, tokens, quotas and usage, shared by the server, the CLI
 * and the web app. Routes (all under /api/v1):
 *
 *   POST   /auth/login                {email, password, returnToken?} → LoginResponse; sets the
 *                                     httpOnly session cookie; with returnToken the session JWT is
 *                                     also in the body (the CLI stores it and sends it as Bearer)
 *   POST   /auth/logout               ends the current session (cookie or Bearer session JWT) → 204
 *   GET    /auth/me                   → Me (user, groups, quota left, how the request was authenticated)
 *   POST   /auth/link                 {token, password, name?, email?} → LoginResponse: accepts an invitation,
 *                                     completes a password reset or the first admin set-up (single use)
 *   GET    /auth/link/:token          → LinkInfo (what the link is for, the e-mail), 404 when used/expired
 *   POST   /auth/password-reset       {email} → 202 always (never reveals whether the e-mail exists)
 *   POST   /invitations               {email, name?, role?, groupId?} → 201 Invitation (admin, researcher)
 *   GET    /tokens                    → {tokens: ApiToken[]}            (the caller's own)
 *   POST   /tokens                    {name, scopes, expiresInDays} → 201 CreatedToken (secret once)
 *   DELETE /tokens/:id                revokes → 204
 *   GET    /groups                    → {groups: Group[]} (admin: all; others: their own)
 *   POST   /admin/groups              {name} → 201 Group
 *   POST   /admin/groups/:id/members  {userId} → 204;  DELETE /admin/groups/:id/members/:userId → 204
 *   GET    /admin/users               → {users: AdminUser[]}
 *   POST   /admin/users               {email, name?, role, groupId?} → 201 Invitation (sends the mail)
 *   PATCH  /admin/users/:id           {role?, disabled?, name?} → AdminUser
 *   PUT    /admin/users/:id/quota     {monthlyPoints: n|null, maxRunning: n|null} → AdminUser (null = default)
 *   GET    /admin/usage?month=YYYY-MM → Usage
 *   GET    /admin/workers             → {workers: WorkerView[]}
 *
 * Credentials: the session cookie `rollway_session`, or `Authorization: Bearer <credential>` where
 * the credential is a session JWT (full rights of the user) or an API token `rwt_…` (the owner's
 * rights narrowed to the token's scopes, never admin). Errors: 401 not signed in / bad or expired
 * credential, 403 signed in but not allowed, 404 for scans the caller may not see.
 */

export const ROLES = ['admin', 'researcher', 'collaborator'] as const;
export type Role = (typeof ROLES)[number];
export const TOKEN_SCOPES = ['read', 'submit'] as const;
export type TokenScope = (typeof TOKEN_SCOPES)[number];
export const SESSION_COOKIE = 'rollway_session';
export const API_TOKEN_PREFIX = 'rwt_';

const email = z.string().trim().toLowerCase().email({ error: 'must be an e-mail address' }).max(254);
/** Long enough to resist guessing, short enough for argon2 to hash cheaply. */
export const passwordSchema = z.string().min(10, { error: 'must be at least 10 characters' }).max(200, { error: 'must be at most 200 characters' });
// One line of text: control characters (NUL among them, which PostgreSQL text cannot hold) are refused.
const name = z.string().trim().max(100, { error: 'must be at most 100 characters' }).regex(/^[^\u0000-\u001f\u007f]*$/, { error: 'must not contain control characters' });
const id = z.number().int().positive();

export const loginRequestSchema = z.strictObject({ email, password: z.string().min(1, { error: 'is required' }).max(200), returnToken: z.boolean().optional() });
/** `email`: only for the first set-up link, to replace the placeholder admin address. */
export const linkRequestSchema = z.strictObject({ token: z.string().min(1).max(200), password: passwordSchema, name: name.optional(), email: email.optional() });
export const resetRequestSchema = z.strictObject({ email });
export const invitationRequestSchema = z.strictObject({ email, name: name.optional(), role: z.enum(ROLES).optional(), groupId: id.optional() });
export const createTokenSchema = z.strictObject({
  name: name.min(1, { error: 'is required' }),
  scopes: z.array(z.enum(TOKEN_SCOPES, { error: `must be one of ${TOKEN_SCOPES.join(', ')}` })).min(1, { error: 'needs at least one scope' }),
  expiresInDays: z.number().int().min(1, { error: 'must be a whole number from 1 to 365' }).max(365, { error: 'must be a whole number from 1 to 365' }),
});
export const createGroupSchema = z.strictObject({ name: name.min(1, { error: 'is required' }) });
export const addMemberSchema = z.strictObject({ userId: id });
export const updateUserSchema = z.strictObject({ role: z.enum(ROLES).optional(), disabled: z.boolean().optional(), name: name.optional() });
const quotaValue = z.number().int().min(0).max(1_000_000_000).nullable();
export const setQuotaSchema = z.strictObject({ monthlyPoints: quotaValue, maxRunning: z.number().int().min(0).max(1000).nullable() });
export const usageQuerySchema = z.strictObject({ month: z.string().regex(/^\d{4}-(0[1-9]|1[0-2])$/, { error: 'must be a month as YYYY-MM' }).optional() });

export const groupSchema = z.object({ id, name: z.string(), memberCount: z.number().int() });
export type Group = z.infer<typeof groupSchema>;

export const userSchema = z.object({ id, email: z.string(), name: z.string(), role: z.enum(ROLES) });
export type User = z.infer<typeof userSchema>;

export const quotaSchema = z.object({
  monthlyPoints: z.number().int(),
  usedPoints: z.number().int(),
  remainingPoints: z.number().int(),
  /** ISO instant of the next reset (start of next calendar month, UTC). */
  resetsAt: z.string(),
  maxRunning: z.number().int(),
  running: z.number().int(),
});
export type Quota = z.infer<typeof quotaSchema>;

export const meSchema = z.object({
  user: userSchema,
  groups: z.array(groupSchema),
  /** Null for collaborators (they cannot submit). */
  quota: quotaSchema.nullable(),
  auth: z.object({ kind: z.enum(['session', 'token']), scopes: z.array(z.enum(TOKEN_SCOPES)).nullable(), expiresAt: z.string() }),
});
export type Me = z.infer<typeof meSchema>;

export const loginResponseSchema = z.object({ user: userSchema, expiresAt: z.string(), token: z.string().optional() });
export type LoginResponse = z.infer<typeof loginResponseSchema>;

export const linkInfoSchema = z.object({ purpose: z.enum(['invitation', 'password_reset', 'setup']), email: z.string(), expiresAt: z.string() });
export type LinkInfo = z.infer<typeof linkInfoSchema>;

export const invitationSchema = z.object({ user: userSchema, expiresAt: z.string() });

export const apiTokenSchema = z.object({
  id, name: z.string(), scopes: z.array(z.enum(TOKEN_SCOPES)), prefix: z.string(),
  expiresAt: z.string(), lastUsedAt: z.string().nullable(), createdAt: z.string(), revoked: z.boolean(),
});
export type ApiToken = z.infer<typeof apiTokenSchema>;
export const createdTokenSchema = z.object({ token: apiTokenSchema, secret: z.string() });
export type CreatedToken = z.infer<typeof createdTokenSchema>;

export const adminUserSchema = userSchema.extend({
  disabled: z.boolean(),
  groups: z.array(z.object({ id, name: z.string() })),
  quota: z.object({ monthlyPoints: z.number().int(), maxRunning: z.number().int(), custom: z.boolean() }),
  usedPointsThisMonth: z.number().int(),
  createdAt: z.string(),
});
export type AdminUser = z.infer<typeof adminUserSchema>;

export const usageSchema = z.object({
  month: z.string(),
  users: z.array(z.object({ userId: id, email: z.string(), name: z.string(), scans: z.number().int(), pointsCharged: z.number().int(), pointsComputed: z.number().int(), computeSeconds: z.number() })),
});
export type Usage = z.infer<typeof usageSchema>;

export const workerViewSchema = z.object({
  id: z.string(), host: z.string(), pid: z.number().int(), concurrency: z.number().int(),
  pointsDone: z.number().int(), pointsPerSecond: z.number().nullable(),
  startedAt: z.string(), lastHeartbeatAt: z.string(), stoppedAt: z.string().nullable(),
  /** active: heartbeat within the lease timeout; silent: overdue; stopped: left the pool. */
  status: z.enum(['active', 'silent', 'stopped']),
});
export type WorkerView = z.infer<typeof workerViewSchema>;

import { ROLES, type Role } from '../../shared/api/accounts.ts';

/**
 * Who may call which API route: the one place that says so. Paths are relative to /api/v1, with
 * `:name` for one path segment. A request that matches no rule is refused (404), so a route added
 * without a rule cannot be reached by accident.
 *
 * - `roles`: the roles of a signed-in user that may call it (`public`: no sign-in needed).
 * - `token`: what an API token needs to call it: a scope, `any` scope, or `never` (sessions only;
 *   admin routes and credential management are never open to tokens).
 * - `scan`: the route names a scan by `:id`: `read` needs the caller to see it (owner, a member of
 *   its group, or an admin; otherwise 404 so ids do not leak), `manage` to own it (or be admin).
 */
export type TokenRule = 'read' | 'submit' | 'any' | 'never';
export interface AccessRule {
  method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  path: string;
  roles: readonly Role[] | 'public';
  token: TokenRule;
  scan?: 'read' | 'manage';
}

const everyone = ROLES;
const submitters: readonly Role[] = ['admin', 'researcher'];
const admins: readonly Role[] = ['admin'];

const rule = (method: AccessRule['method'], path: string, roles: AccessRule['roles'], token: TokenRule, scan?: AccessRule['scan']): AccessRule =>
  scan ? { method, path, roles, token, scan } : { method, path, roles, token };

export const ACCESS_RULES: readonly AccessRule[] = [
  rule('GET', '/health', 'public', 'any'),
  rule('GET', '/ready', 'public', 'any'),

  rule('POST', '/auth/login', 'public', 'any'),
  rule('POST', '/auth/password-reset', 'public', 'any'),
  rule('GET', '/auth/link/:token', 'public', 'any'),
  rule('POST', '/auth/link', 'public', 'any'),
  rule('POST', '/auth/logout', everyone, 'never'),
  rule('GET', '/auth/me', everyone, 'any'),

  rule('GET', '/tokens', everyone, 'never'),
  rule('POST', '/tokens', everyone, 'never'),
  rule('DELETE', '/tokens/:id', everyone, 'never'),
  rule('GET', '/groups', everyone, 'read'),
  rule('POST', '/invitations', submitters, 'never'),

  rule('GET', '/scans', everyone, 'read'),
  rule('POST', '/scans', submitters, 'submit'),
  rule('GET', '/scans/:id', everyone, 'read', 'read'),
  rule('GET', '/scans/:id/events', everyone, 'read', 'read'),
  rule('POST', '/scans/:id/cancel', submitters, 'submit', 'manage'),
  rule('POST', '/scans/:id/clone', submitters, 'submit', 'read'),
  rule('DELETE', '/scans/:id', submitters, 'submit', 'manage'),
  rule('GET', '/scans/:id/results', everyone, 'read', 'read'),
  rule('GET', '/scans/:id/summary', everyone, 'read', 'read'),
  rule('GET', '/scans/:id/heatmap', everyone, 'read', 'read'),
  rule('GET', '/scans/:id/download', everyone, 'read', 'read'),
  rule('GET', '/scans/:id/plane', everyone, 'read', 'read'),
  rule('GET', '/scans/:id/points/:index', everyone, 'read', 'read'),

  rule('GET', '/admin/users', admins, 'never'),
  rule('POST', '/admin/users', admins, 'never'),
  rule('PATCH', '/admin/users/:id', admins, 'never'),
  rule('PUT', '/admin/users/:id/quota', admins, 'never'),
  rule('POST', '/admin/groups', admins, 'never'),
  rule('POST', '/admin/groups/:id/members', admins, 'never'),
  rule('DELETE', '/admin/groups/:id/members/:userId', admins, 'never'),
  rule('GET', '/admin/usage', admins, 'never'),
  rule('GET', '/admin/workers', admins, 'never'),
];

const compiled = ACCESS_RULES.map((r) => ({
  rule: r,
  pattern: new RegExp(`^${r.path.replace(/:[A-Za-z]+/g, '[^/]+')}/?$`),
  idAt: r.path.split('/').indexOf(':id'),
}));

/** The rule of a request (path relative to /api/v1), with the raw `:id` segment when it has one. */
export function matchRule(method: string, path: string): { rule: AccessRule; id?: string } | undefined {
  const verb = method === 'HEAD' ? 'GET' : method;
  const found = compiled.find((c) => c.rule.method === verb && c.pattern.test(path));
  if (!found) return undefined;
  return found.idAt < 0 ? { rule: found.rule } : { rule: found.rule, id: path.split('/')[found.idAt] };
}

/** Other methods allowed on a path, so a wrong method is told apart from an unknown path. */
export const pathKnown = (path: string): boolean => compiled.some((c) => c.pattern.test(path));

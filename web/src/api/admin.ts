import { z } from 'zod';
import {
  adminUserSchema, groupSchema, invitationSchema, usageSchema, workerViewSchema,
  type invitationRequestSchema, type setQuotaSchema, type updateUserSchema,
} from '../../../shared/api/accounts.ts';
import { request } from './http.ts';

const users = z.object({ users: z.array(adminUserSchema) });
const groups = z.object({ groups: z.array(groupSchema) });
const workers = z.object({ workers: z.array(workerViewSchema) });

/** Groups (everyone: their own; admins: all) and the admin routes of shared/api/accounts.ts. */
export const adminApi = {
  groups: async () => (await request('GET', '/groups', { schema: groups })).groups,
  createGroup: (name: string) => request('POST', '/admin/groups', { body: { name }, schema: groupSchema }),
  addMember: (groupId: number, userId: number) => request<void>('POST', `/admin/groups/${groupId}/members`, { body: { userId } }),
  removeMember: (groupId: number, userId: number) => request<void>('DELETE', `/admin/groups/${groupId}/members/${userId}`),
  users: async () => (await request('GET', '/admin/users', { schema: users })).users,
  inviteUser: (body: z.input<typeof invitationRequestSchema>) => request('POST', '/admin/users', { body, schema: invitationSchema }),
  updateUser: (id: number, body: z.input<typeof updateUserSchema>) => request('PATCH', `/admin/users/${id}`, { body, schema: adminUserSchema }),
  setQuota: (id: number, body: z.input<typeof setQuotaSchema>) => request('PUT', `/admin/users/${id}/quota`, { body, schema: adminUserSchema }),
  usage: (month: string) => request('GET', `/admin/usage?month=${encodeURIComponent(month)}`, { schema: usageSchema }),
  workers: async () => (await request('GET', '/admin/workers', { schema: workers })).workers,
};

import type { AdminUser, Role, Usage } from '../../shared/api/accounts.ts';
import { ConflictError, ForbiddenError, InvalidInputError, NotFoundError } from '../../shared/errors.ts';
import type { Actor } from '../auth/actor.ts';
import { revokeSessionsOf } from '../auth/credentialsRepository.ts';
import type { Database } from '../db/client.ts';
import type { Mailer } from '../mail/mailer.ts';
import { invitationMail } from '../mail/templates.ts';
import { issueLink } from './links.ts';
import { limitsOf, type QuotaDefaults } from './quota.ts';
import { chargedByUser, monthOf, usageOfMonth } from './usageRepository.ts';
import {
  addMember, countActiveAdmins, findGroup, findGroupByName, findUser, findUserByEmail, insertGroup, insertUser, listGroups,
  listUsers, membershipsByUser, removeMember, updateUser, type UserRow,
} from './usersRepository.ts';
import { publicUser } from './authService.ts';

export interface AdminServiceDeps {
  db: Database;
  mailer: Mailer;
  publicUrl: string;
  quotaDefaults: QuotaDefaults;
}

export type AdminService = ReturnType<typeof createAdminService>;

export function createAdminService({ db, mailer, publicUrl, quotaDefaults }: AdminServiceDeps) {
  const userOr404 = async (id: number): Promise<UserRow> => {
    const user = await findUser(db, id);
    if (!user) throw new NotFoundError(`user ${id} does not exist`);
    return user;
  };
  const groupOr404 = async (id: number) => {
    const group = await findGroup(db, id);
    if (!group) throw new NotFoundError(`group ${id} does not exist`);
    return group;
  };

  const adminView = async (user: UserRow): Promise<AdminUser> => (await listAdminUsers([user])).at(0)!;
  const listAdminUsers = async (rows?: UserRow[]): Promise<AdminUser[]> => {
    const [all, memberships, charged] = await Promise.all([rows ?? listUsers(db), membershipsByUser(db), chargedByUser(db, monthOf(new Date()))]);
    return all.map((u) => ({
      ...publicUser(u), disabled: u.disabled, groups: memberships.get(u.id) ?? [], quota: limitsOf(u, quotaDefaults),
      usedPointsThisMonth: charged.get(u.id) ?? 0, createdAt: u.createdAt.toISOString(),
    }));
  };

  /** The last active admin cannot lose the role or be disabled: the server would have no admin. */
  const keepAnAdmin = async (user: UserRow, change: { role?: Role | undefined; disabled?: boolean | undefined }) => {
    const losesAdmin = user.role === 'admin' && !user.disabled && ((change.role !== undefined && change.role !== 'admin') || change.disabled === true);
    if (losesAdmin && (await countActiveAdmins(db)) <= 1) throw new ConflictError('this is the last active admin; make another admin first', 'last_admin');
  };

  return {
    listUsers: () => listAdminUsers(),

    /**
     * Invites by e-mail. Admins may invite any role into any group; researchers invite
     * collaborators into their own groups only.
     */
    async invite(actor: Actor, input: { email: string; name?: string | undefined; role?: Role | undefined; groupId?: number | undefined }) {
      const role = input.role ?? 'collaborator';
      if (actor.role !== 'admin' && role !== 'collaborator') throw new ForbiddenError(`researchers can invite collaborators only; ask an admin to invite a ${role}`);
      if (input.groupId !== undefined) {
        await groupOr404(input.groupId);
        if (actor.role !== 'admin' && !actor.groupIds.includes(input.groupId)) {
          throw new InvalidInputError(`groupId: you are not a member of group ${input.groupId}; invite into one of your own groups`, 'groupId');
        }
      }
      const existing = await findUserByEmail(db, input.email);
      if (existing?.passwordHash) throw new ConflictError(`${input.email} already has an account; add them to a group instead`, 'user_exists');
      const user = existing ?? (await insertUser(db, { email: input.email, name: input.name ?? '', role }));
      if (input.groupId !== undefined) await addMember(db, input.groupId, user.id);
      const { url, expiresAt } = await issueLink(db, publicUrl, user.id, 'invitation');
      await mailer.send(invitationMail({ to: user.email, inviterName: actor.name || actor.email, link: url, expiresAt, role: user.role }));
      return { user: publicUser(user), expiresAt: expiresAt.toISOString() };
    },

    async updateUser(id: number, change: { role?: Role | undefined; disabled?: boolean | undefined; name?: string | undefined }) {
      const user = await userOr404(id);
      await keepAnAdmin(user, change);
      const updated = await updateUser(db, id, change);
      // Disabling or a lower role must take effect now, not at the session's expiry.
      if (change.disabled === true || (change.role !== undefined && change.role !== user.role)) await revokeSessionsOf(db, id);
      return adminView(updated!);
    },

    async setQuota(id: number, quota: { monthlyPoints: number | null; maxRunning: number | null }) {
      await userOr404(id);
      return adminView((await updateUser(db, id, { monthlyPointQuota: quota.monthlyPoints, maxRunningScans: quota.maxRunning }))!);
    },

    groups: (actor: Actor) => listGroups(db, actor.role === 'admin' ? undefined : actor.groupIds),

    async createGroup(name: string) {
      if (await findGroupByName(db, name)) throw new ConflictError(`a group named "${name}" exists already`, 'group_exists');
      const group = await insertGroup(db, name);
      return { id: group.id, name: group.name, memberCount: 0 };
    },

    async addMember(groupId: number, userId: number) {
      await groupOr404(groupId);
      await userOr404(userId);
      await addMember(db, groupId, userId);
    },

    async removeMember(groupId: number, userId: number) {
      await groupOr404(groupId);
      if (!(await removeMember(db, groupId, userId))) throw new NotFoundError(`user ${userId} is not a member of group ${groupId}`);
    },

    async usage(month = monthOf(new Date())): Promise<Usage> {
      return { month, users: await usageOfMonth(db, month) };
    },
  };
}

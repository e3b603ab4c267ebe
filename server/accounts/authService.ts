import type { Logger } from 'pino';
import type { LinkInfo, LoginResponse, Me } from '../../shared/api/accounts.ts';
import { ConflictError, NotFoundError, UnauthorizedError } from '../../shared/errors.ts';
import type { Actor } from '../auth/actor.ts';
import { consumeLink, findLiveLink, revokeSessionsOf } from '../auth/credentialsRepository.ts';
import { hashPassword, verifyPassword } from '../auth/passwords.ts';
import { hashSecret } from '../auth/secrets.ts';
import type { Sessions } from '../auth/sessions.ts';
import type { Database } from '../db/client.ts';
import type { Mailer } from '../mail/mailer.ts';
import { passwordResetMail } from '../mail/templates.ts';
import { issueLink } from './links.ts';
import { quotaOf, type QuotaDefaults } from './quota.ts';
import { findUser, findUserByEmail, listGroups, updateUser, type UserRow } from './usersRepository.ts';

export interface AuthServiceDeps {
  db: Database;
  sessions: Sessions;
  mailer: Mailer;
  publicUrl: string;
  quotaDefaults: QuotaDefaults;
  logger: Logger;
}

// The same words for an unknown e-mail, a wrong password and a disabled account: nothing leaks.
const BAD_LOGIN = 'the e-mail or password is not correct';

export const publicUser = (u: UserRow) => ({ id: u.id, email: u.email, name: u.name, role: u.role });

export type AuthService = ReturnType<typeof createAuthService>;

export function createAuthService({ db, sessions, mailer, publicUrl, quotaDefaults, logger }: AuthServiceDeps) {
  const startSession = async (user: UserRow): Promise<LoginResponse & { token: string }> => {
    const session = await sessions.create(user.id);
    return { user: publicUser(user), expiresAt: session.expiresAt.toISOString(), token: session.token };
  };

  const liveLink = async (secret: string) => {
    const found = await findLiveLink(db, hashSecret(secret));
    if (!found || found.user.disabled) throw new NotFoundError('this link is not valid any more (used, replaced or expired); ask for a new one');
    return found;
  };

  return {
    async login(email: string, password: string) {
      const user = await findUserByEmail(db, email);
      const ok = await verifyPassword(user?.passwordHash, password);
      if (!user || !ok || user.disabled) throw new UnauthorizedError(BAD_LOGIN);
      return startSession(user);
    },

    logout: (actor: Actor) => (actor.sessionId ? sessions.revoke(actor.sessionId) : Promise.resolve()),

    async me(actor: Actor): Promise<Me> {
      const user = await findUser(db, actor.userId);
      if (!user) throw new UnauthorizedError();
      return {
        user: { ...publicUser(user), role: actor.role },
        groups: await listGroups(db, actor.groupIds),
        quota: actor.role === 'collaborator' ? null : await quotaOf(db, user, quotaDefaults),
        auth: { kind: actor.via, scopes: actor.scopes, expiresAt: actor.expiresAt.toISOString() },
      };
    },

    async linkInfo(secret: string): Promise<LinkInfo> {
      const { link, user } = await liveLink(secret);
      return { purpose: link.purpose, email: user.email, expiresAt: link.expiresAt.toISOString() };
    },

    /** Invitation, password reset or first set-up: sets the password, uses the link up, signs in. */
    async acceptLink(input: { token: string; password: string; name?: string | undefined; email?: string | undefined }) {
      const { link, user } = await liveLink(input.token);
      const newEmail = link.purpose === 'setup' && input.email && input.email !== user.email ? input.email : undefined;
      if (newEmail && (await findUserByEmail(db, newEmail))) throw new ConflictError(`email: ${newEmail} already has an account`, 'user_exists');
      if (!(await consumeLink(db, link.id))) throw new NotFoundError('this link has just been used; ask for a new one');
      // A new password ends every other session of the account (someone else may hold one).
      await revokeSessionsOf(db, user.id);
      const updated = await updateUser(db, user.id, {
        passwordHash: await hashPassword(input.password),
        ...(input.name ? { name: input.name } : {}),
        ...(newEmail ? { email: newEmail } : {}),
      });
      return startSession(updated!);
    },

    /** Always answers the same; mails a link only when the account exists and may sign in. */
    async requestReset(email: string): Promise<void> {
      const user = await findUserByEmail(db, email);
      if (!user || user.disabled) {
        logger.info({ email }, 'password reset asked for an unknown or disabled account; nothing sent');
        return;
      }
      const { url, expiresAt } = await issueLink(db, publicUrl, user.id, 'password_reset');
      await mailer.send(passwordResetMail({ to: user.email, link: url, expiresAt }));
    },
  };
}

import type { Logger } from 'pino';
import { hashPassword } from '../auth/passwords.ts';
import type { Database } from '../db/client.ts';
import type { AccountsConfig } from './accountsConfig.ts';
import { issueLink } from './links.ts';
import { countUsableAdmins, findUserByEmail, insertUser, updateUser } from './usersRepository.ts';

const PLACEHOLDER_ADMIN = 'admin@localhost';

/**
 * First start: an admin from ROLLWAY_ADMIN_EMAIL / ROLLWAY_ADMIN_PASSWORD when set (an existing
 * password is never overwritten); else, while no admin can sign in, a one-time set-up link.
 * Returns the link so the caller can print it where the operator looks.
 */
export async function ensureAdmin(db: Database, config: AccountsConfig, publicUrl: string, logger: Logger): Promise<string | undefined> {
  if (config.adminEmail && config.adminPassword) {
    const existing = await findUserByEmail(db, config.adminEmail);
    if (!existing) {
      await insertUser(db, { email: config.adminEmail, role: 'admin', name: 'Administrator', passwordHash: await hashPassword(config.adminPassword) });
      logger.info({ email: config.adminEmail }, 'admin account created from ROLLWAY_ADMIN_EMAIL');
    } else if (!existing.passwordHash) {
      await updateUser(db, existing.id, { role: 'admin', passwordHash: await hashPassword(config.adminPassword) });
    }
    return undefined;
  }
  if ((await countUsableAdmins(db)) > 0) return undefined;
  const placeholder = (await findUserByEmail(db, PLACEHOLDER_ADMIN)) ?? (await insertUser(db, { email: PLACEHOLDER_ADMIN, role: 'admin', name: 'Administrator' }));
  const { url } = await issueLink(db, publicUrl, placeholder.id, 'setup');
  return url;
}

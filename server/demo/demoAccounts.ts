import type { Role } from '../../shared/api/accounts.ts';
import { hashPassword } from '../auth/passwords.ts';
import type { Actor } from '../auth/actor.ts';
import type { Database } from '../db/client.ts';
import { addMember, findGroupByName, findUserByEmail, groupIdsOf, insertGroup, insertUser, updateUser } from '../accounts/usersRepository.ts';

/**
 * The invented demo scenario's people: a small research group scanning plateau and hilltop models.
 * Passwords are printed by `rollway serve --demo` and written in README; demo data only.
 */
export const DEMO_GROUP = 'Lantern Hill inflation group';
export const DEMO_ACCOUNTS: { email: string; name: string; role: Role; password: string }[] = [
  { email: 'admin@lanternhill.example', name: 'Demo Admin', role: 'admin', password: 'lantern-admin-demo' },
  { email: 'iris@lanternhill.example', name: 'Iris Vantongeren', role: 'researcher', password: 'lantern-iris-demo' },
  { email: 'teo@lanternhill.example', name: 'Teo Marchetti', role: 'collaborator', password: 'lantern-teo-demo' },
];

/** Creates the demo group and accounts that are missing; returns the researcher, who owns the demo scans. */
export async function seedDemoAccounts(db: Database): Promise<Actor> {
  const group = (await findGroupByName(db, DEMO_GROUP)) ?? (await insertGroup(db, DEMO_GROUP));
  for (const account of DEMO_ACCOUNTS) {
    const user = (await findUserByEmail(db, account.email))
      ?? (await insertUser(db, { email: account.email, name: account.name, role: account.role, passwordHash: await hashPassword(account.password) }));
    if (account.role !== 'admin') await addMember(db, group.id, user.id);
  }
  // The demo queues every example at once: more than the default limit of scans running together.
  const researcher = (await updateUser(db, (await findUserByEmail(db, DEMO_ACCOUNTS[1]!.email))!.id, { maxRunningScans: 10 }))!;
  return {
    userId: researcher.id, email: researcher.email, name: researcher.name, role: researcher.role, groupIds: await groupIdsOf(db, researcher.id),
    via: 'session', scopes: null, sessionId: null, tokenId: null, expiresAt: new Date(Date.now() + 3600_000),
  };
}

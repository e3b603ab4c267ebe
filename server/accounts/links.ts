import type { Database } from '../db/client.ts';
import { insertLink, type LinkPurpose } from '../auth/credentialsRepository.ts';
import { hashSecret, newSecret } from '../auth/secrets.ts';

/** How long each kind of single-use link works. */
export const LINK_LIFETIME_HOURS: Record<LinkPurpose, number> = { invitation: 24 * 7, password_reset: 1, setup: 24 };

/** A new single-use link for the user (earlier unused ones of the same purpose stop working). */
export async function issueLink(db: Database, publicUrl: string, userId: number, purpose: LinkPurpose): Promise<{ url: string; expiresAt: Date }> {
  const secret = newSecret();
  const expiresAt = new Date(Date.now() + LINK_LIFETIME_HOURS[purpose] * 3600_000);
  await insertLink(db, { userId, purpose, secretHash: hashSecret(secret), expiresAt });
  return { url: `${publicUrl}/link/${secret}`, expiresAt };
}

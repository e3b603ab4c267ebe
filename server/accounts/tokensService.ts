import { API_TOKEN_PREFIX, type ApiToken, type CreatedToken, type TokenScope } from '../../shared/api/accounts.ts';
import { NotFoundError } from '../../shared/errors.ts';
import type { Actor } from '../auth/actor.ts';
import { insertApiToken, listApiTokens, revokeApiToken, type ApiTokenRow } from '../auth/credentialsRepository.ts';
import { hashSecret, newSecret } from '../auth/secrets.ts';
import type { Database } from '../db/client.ts';

const view = (t: ApiTokenRow): ApiToken => ({
  id: t.id, name: t.name, scopes: t.scopes, prefix: t.prefix, expiresAt: t.expiresAt.toISOString(),
  lastUsedAt: t.lastUsedAt?.toISOString() ?? null, createdAt: t.createdAt.toISOString(), revoked: t.revokedAt !== null,
});

export type TokensService = ReturnType<typeof createTokensService>;

/** API tokens of the signed-in user: the secret is returned once, only its hash is kept. */
export function createTokensService(db: Database) {
  return {
    list: async (actor: Actor): Promise<ApiToken[]> => (await listApiTokens(db, actor.userId)).map(view),
    async create(actor: Actor, input: { name: string; scopes: TokenScope[]; expiresInDays: number }): Promise<CreatedToken> {
      const secret = newSecret(API_TOKEN_PREFIX);
      const row = await insertApiToken(db, {
        userId: actor.userId, name: input.name, scopes: [...new Set(input.scopes)], secretHash: hashSecret(secret),
        prefix: secret.slice(0, API_TOKEN_PREFIX.length + 6), expiresAt: new Date(Date.now() + input.expiresInDays * 86_400_000),
      });
      return { token: view(row), secret };
    },
    async revoke(actor: Actor, id: number): Promise<void> {
      if (!(await revokeApiToken(db, actor.userId, id))) throw new NotFoundError(`you have no active API token with id ${id}`);
    },
  };
}

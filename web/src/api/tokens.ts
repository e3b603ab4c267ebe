import { z } from 'zod';
import { apiTokenSchema, createdTokenSchema, type createTokenSchema } from '../../../shared/api/accounts.ts';
import { request } from './http.ts';

const tokenListSchema = z.object({ tokens: z.array(apiTokenSchema) });

/** The caller's own API tokens. */
export const tokensApi = {
  list: async () => (await request('GET', '/tokens', { schema: tokenListSchema })).tokens,
  create: (body: z.input<typeof createTokenSchema>) => request('POST', '/tokens', { body, schema: createdTokenSchema }),
  revoke: (id: number) => request<void>('DELETE', `/tokens/${id}`),
};

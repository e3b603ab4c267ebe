import type { z } from 'zod';
import { linkInfoSchema, loginResponseSchema, meSchema, type linkRequestSchema, type loginRequestSchema } from '../../../shared/api/accounts.ts';
import { request } from './http.ts';

/** Sign-in, session and single-use links (shared/api/accounts.ts lists the routes). */
export const authApi = {
  me: () => request('GET', '/auth/me', { schema: meSchema }),
  login: (body: z.input<typeof loginRequestSchema>) => request('POST', '/auth/login', { body, schema: loginResponseSchema }),
  logout: () => request<void>('POST', '/auth/logout'),
  linkInfo: (token: string) => request('GET', `/auth/link/${encodeURIComponent(token)}`, { schema: linkInfoSchema }),
  acceptLink: (body: z.input<typeof linkRequestSchema>) => request('POST', '/auth/link', { body, schema: loginResponseSchema }),
  requestPasswordReset: (email: string) => request<void>('POST', '/auth/password-reset', { body: { email } }),
};

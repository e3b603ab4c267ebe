import { createApiClient, type ApiClient } from '../shared/api/client.ts';
import { RollwayError } from '../shared/errors.ts';
import { resolveCredential, type Credential } from './credentials.ts';

/** No server to talk to yet: a 401 of our own, so it exits like any other "not signed in". */
export class NotSignedInError extends RollwayError {
  constructor(message = 'not signed in: run rollway login --url URL --email E, or set ROLLWAY_URL (and ROLLWAY_TOKEN)') {
    super('not_signed_in', message, 401);
    this.name = 'NotSignedInError';
  }
}

/** The API client for the server and credential in effect (environment, then the login file). */
export async function connect(): Promise<{ client: ApiClient; credential: Credential }> {
  const credential = await resolveCredential();
  if (!credential.url) throw new NotSignedInError();
  return { client: createApiClient({ url: credential.url, token: credential.token }), credential };
}

/**
 * Credentials for tests that exercise the API as a signed-in user. The server is real (sign-in
 * through POST /auth/login); `attachCredential` only saves every test from passing the header.
 */
export const TEST_ADMIN = { email: 'admin@rollway.test', password: 'test-admin-password' };
export const TEST_ADMIN_ENV = { ROLLWAY_ADMIN_EMAIL: TEST_ADMIN.email, ROLLWAY_ADMIN_PASSWORD: TEST_ADMIN.password };

/** Signs in and returns the session JWT (sent as a Bearer credential). */
export async function signIn(origin: string, email: string, password: string): Promise<string> {
  const res = await fetch(`${origin}/api/v1/auth/login`, {
    method: 'POST', headers: { 'content-type': 'application/json', authorization: '' },
    body: JSON.stringify({ email, password, returnToken: true }),
  });
  if (res.status !== 200) throw new Error(`sign-in of ${email} failed: ${res.status} ${await res.text()}`);
  return ((await res.json()) as { token: string }).token;
}

const credentials = new Map<string, string>();
let wrapped = false;

/**
 * From now on, requests from this process to `origin` without an Authorization header carry this
 * credential. A test that wants to be anonymous sends `authorization: ''` explicitly.
 */
export function attachCredential(origin: string, token: string): void {
  credentials.set(new URL(origin).origin, token);
  if (wrapped) return;
  wrapped = true;
  const original = globalThis.fetch;
  globalThis.fetch = (input: string | URL | Request, init?: RequestInit) => {
    const url = new URL(input instanceof Request ? input.url : String(input));
    const token = credentials.get(url.origin);
    const headers = new Headers(init?.headers ?? (input instanceof Request ? input.headers : undefined));
    if (token === undefined || headers.has('authorization')) return original(input, init);
    headers.set('authorization', `Bearer ${token}`);
    return original(input, { ...init, headers });
  };
}

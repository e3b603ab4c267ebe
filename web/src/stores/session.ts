import { defineStore } from 'pinia';
import { computed, ref } from 'vue';
import type { Me } from '../../../shared/api/accounts.ts';
import { authApi } from '../api/auth.ts';
import { ApiError } from '../api/http.ts';

/**
 * Who is signed in, from GET /auth/me. `unknown` until first checked; `error` when the check itself
 * failed (server unreachable), so pages can say so instead of pretending the user is signed out.
 */
export type SessionStatus = 'unknown' | 'signedIn' | 'signedOut' | 'error';

export const useSessionStore = defineStore('session', () => {
  const me = ref<Me | null>(null);
  const status = ref<SessionStatus>('unknown');
  const error = ref<ApiError | null>(null);
  let pending: Promise<void> | undefined;

  const user = computed(() => me.value?.user ?? null);
  const isAdmin = computed(() => user.value?.role === 'admin');
  /** Collaborators browse and compare; only researchers and admins spend quota. */
  const canSubmit = computed(() => user.value?.role === 'admin' || user.value?.role === 'researcher');

  async function check(): Promise<void> {
    try {
      me.value = await authApi.me();
      status.value = 'signedIn';
      error.value = null;
    } catch (e) {
      me.value = null;
      if (e instanceof ApiError && e.status === 401) {
        status.value = 'signedOut';
        error.value = null;
      } else {
        status.value = 'error';
        error.value = e instanceof ApiError ? e : new ApiError(0, 'unexpected', String(e));
      }
    }
  }

  /**
   * Checks the session once (concurrent callers share the request); `force` checks again. A
   * check already in flight when `force` comes (after signing in) may have been sent before the
   * session existed, so a forced load runs a new check after it instead of sharing its answer.
   */
  function load(force = false): Promise<void> {
    if (!force && status.value !== 'unknown' && status.value !== 'error') return Promise.resolve();
    if (pending && !force) return pending;
    const run: Promise<void> = (pending ?? Promise.resolve()).then(check).finally(() => {
      if (pending === run) pending = undefined;
    });
    pending = run;
    return run;
  }

  async function signIn(email: string, password: string): Promise<void> {
    await authApi.login({ email, password });
    await load(true);
  }

  /** Accepts an invitation, a password reset or the first set-up; the server signs the user in. */
  async function acceptLink(token: string, password: string, name?: string): Promise<void> {
    await authApi.acceptLink({ token, password, ...(name ? { name } : {}) });
    await load(true);
  }

  async function signOut(): Promise<void> {
    try {
      await authApi.logout();
    } finally {
      expire();
    }
  }

  /** The session ended elsewhere (a 401 from any request). */
  function expire(): void {
    me.value = null;
    status.value = 'signedOut';
  }

  return { me, status, error, user, isAdmin, canSubmit, load, signIn, acceptLink, signOut, expire };
});

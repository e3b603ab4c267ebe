import { onMounted, ref } from 'vue';
import type { Group, Quota } from '../../../shared/api/accounts.ts';
import { adminApi } from '../api/admin.ts';
import { authApi } from '../api/auth.ts';
import { ApiError } from '../api/http.ts';

/** Why a figure is missing, in words: a server without accounts answers 404, a lapsed session 401. */
function unavailable(err: unknown, what: string): string {
  if (err instanceof ApiError && err.status === 404) return `This server has no accounts, so no ${what} applies.`;
  if (err instanceof ApiError && err.status === 401) return `Sign in to see your ${what}.`;
  return `Your ${what} could not be loaded: ${(err as Error).message}`;
}

/** The submitter's quota left (GET /auth/me) and the groups a scan can be shared with (GET /groups). */
export function usePlanAccount() {
  const quota = ref<Quota | null>(null);
  const quotaNote = ref('');
  const groups = ref<Group[]>([]);
  const groupsNote = ref('');
  const loading = ref(true);

  async function load() {
    loading.value = true;
    const [me, list] = await Promise.allSettled([authApi.me(), adminApi.groups()]);
    if (me.status === 'fulfilled') {
      quota.value = me.value.quota;
      quotaNote.value = me.value.quota ? '' : 'Your role cannot submit scans, so it has no quota.';
    } else quotaNote.value = unavailable(me.reason, 'quota');
    if (list.status === 'fulfilled') groups.value = list.value;
    else groupsNote.value = unavailable(list.reason, 'groups');
    loading.value = false;
  }

  onMounted(load);
  return { quota, quotaNote, groups, groupsNote, loading, reload: load };
}

import { createPinia } from 'pinia';
import type { App } from 'vue';
import { setUnauthorizedHandler } from '../api/http.ts';
import { router } from '../router/index.ts';
import { useSessionStore } from '../stores/session.ts';
import { vuetify } from './vuetify.ts';

/** Pinia first: the router's guard reads the session store. */
export function registerPlugins(app: App): void {
  const pinia = createPinia();
  app.use(pinia).use(vuetify).use(router);
  // A request answered 401 mid-visit: the session ended, so sign in again and come back here.
  setUnauthorizedHandler(() => {
    useSessionStore(pinia).expire();
    const here = router.currentRoute.value;
    if (!here.meta.public) void router.push({ name: 'sign-in', query: { next: here.fullPath } });
  });
}

import { createRouter, createWebHistory, type RouteRecordRaw } from 'vue-router';
import { useSessionStore } from '../stores/session.ts';

declare module 'vue-router' {
  interface RouteMeta {
    /** Reachable without signing in (sign-in, links, password reset). */
    public?: boolean;
    /** Who may open it besides being signed in. */
    requires?: 'submit' | 'admin';
    /** Shown in the window title. */
    title?: string;
  }
}

/** Every view is lazy-loaded, so AG Grid and ECharts load only with the pages that use them. */
const routes: RouteRecordRaw[] = [
  { path: '/', redirect: { name: 'scans' } },
  { path: '/sign-in', name: 'sign-in', component: () => import('../views/SignInView.vue'), meta: { public: true, title: 'Sign in' } },
  { path: '/forgot-password', name: 'forgot-password', component: () => import('../views/PasswordResetView.vue'), meta: { public: true, title: 'Reset your password' } },
  { path: '/link/:token', name: 'link', component: () => import('../views/LinkView.vue'), meta: { public: true, title: 'Set your password' } },
  { path: '/scans', name: 'scans', component: () => import('../views/ScansView.vue'), meta: { title: 'Scans' } },
  { path: '/scans/new', name: 'new-scan', component: () => import('../views/NewScanView.vue'), meta: { requires: 'submit', title: 'New scan' } },
  { path: '/scans/:id(\\d+)', name: 'scan', component: () => import('../views/ScanView.vue'), meta: { title: 'Scan' } },
  { path: '/scans/:id(\\d+)/points/:index(\\d+)', name: 'point', component: () => import('../views/PointDetailView.vue'), meta: { title: 'Point' } },
  { path: '/compare', name: 'compare', component: () => import('../views/CompareView.vue'), meta: { title: 'Compare scans' } },
  { path: '/tokens', name: 'tokens', component: () => import('../views/TokensView.vue'), meta: { title: 'API tokens' } },
  { path: '/admin', name: 'admin', component: () => import('../views/AdminView.vue'), meta: { requires: 'admin', title: 'Administration' } },
  { path: '/:rest(.*)*', name: 'not-found', component: () => import('../views/NotFoundView.vue'), meta: { public: true, title: 'Not found' } },
];

export const router = createRouter({ history: createWebHistory(), routes });

/** Typed links to the routes other pages point at. */
export const to = {
  scan: (id: number) => ({ name: 'scan', params: { id: String(id) } }) as const,
  point: (scanId: number, index: number) => ({ name: 'point', params: { id: String(scanId), index: String(index) } }) as const,
  compare: (ids: readonly number[]) => ({ name: 'compare', query: { ids: ids.join(',') } }) as const,
};

/** Only same-app paths count as a place to return to after signing in (no open redirect). */
export function returnPath(raw: unknown): string {
  return typeof raw === 'string' && raw.startsWith('/') && !raw.startsWith('//') ? raw : '/scans';
}

router.beforeEach(async (route) => {
  const session = useSessionStore();
  await session.load();
  if (route.meta.public) {
    if (route.name === 'sign-in' && session.status === 'signedIn') return returnPath(route.query.next);
    return true;
  }
  if (session.status === 'signedOut') return { name: 'sign-in', query: { next: route.fullPath } };
  // Unknown user (the session check failed): let the page load; its own requests report the problem.
  if (session.status !== 'signedIn') return true;
  if (route.meta.requires === 'admin' && !session.isAdmin) return { name: 'scans' };
  if (route.meta.requires === 'submit' && !session.canSubmit) return { name: 'scans' };
  return true;
});

router.afterEach((route) => {
  document.title = route.meta.title ? `${route.meta.title} · Rollway` : 'Rollway';
});

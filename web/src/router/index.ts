import { createRouter, createWebHistory } from 'vue-router';

export const router = createRouter({
  history: createWebHistory(),
  routes: [
    { path: '/', redirect: '/scans/new' },
    { path: '/scans/new', name: 'new-scan', component: () => import('../views/NewScanView.vue') },
  ],
});

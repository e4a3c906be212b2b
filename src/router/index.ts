import { createRouter, createWebHistory, type RouterHistory } from 'vue-router';
import { useSessionStore } from '@/stores/session';
import { installGuards } from './guard';
import { routes } from './routes';

export { routes } from './routes';
export * from './guard';

export interface AppRouterOptions {
  history?: RouterHistory;
  /** Shows a short notice, e.g. "That page is for Administrator accounts." (a toast in the app). */
  notify?: (message: string) => void;
}

/** The app's router with its global guard. Pinia must be installed before the first navigation. */
export function createAppRouter(options: AppRouterOptions = {}) {
  const router = createRouter({
    history: options.history ?? createWebHistory(import.meta.env.BASE_URL),
    routes,
    scrollBehavior: (_to, _from, saved) => saved ?? { top: 0 },
  });
  installGuards(router, {
    loadSession: () => useSessionStore().load(),
    currentUser: () => useSessionStore().user,
    notify: options.notify ?? (() => undefined),
  });
  return router;
}

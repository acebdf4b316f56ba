import { createRouter, createWebHistory, type Router, type RouterHistory } from 'vue-router';
import { useSessionStore } from '@/stores/session';
import { accessDecision, pageTitle } from './guards';
import { routes } from './routes';

/**
 * The app's router with its guards. Pinia must be installed first: the guard waits for the
 * session to load once, then decides with `accessDecision`.
 */
export function createAppRouter(history: RouterHistory = createWebHistory()): Router {
  const router = createRouter({ history, routes, scrollBehavior: () => ({ top: 0 }) });
  router.beforeEach(async (to) => {
    const session = useSessionStore();
    await session.ensureLoaded();
    return accessDecision(to, session.me);
  });
  router.afterEach((to) => {
    document.title = pageTitle(to.meta.title);
  });
  return router;
}

import { createRouter, createWebHistory, type RouteRecordRaw, type Router, type RouterHistory } from 'vue-router';
import { ROLES, type Role } from '@shared/schemas';
import { useSessionStore } from '@/stores/session';

declare module 'vue-router' {
  interface RouteMeta {
    /** Shown in the browser tab. */
    title?: string;
    /** Reachable without signing in. */
    public?: boolean;
    /** Only for signed-out visitors (sign-in): signed-in users go home. */
    guestOnly?: boolean;
    /** Roles that may open the screen; absent means every signed-in role. */
    roles?: readonly Role[];
    /** Full-page layout without the navigation bar. */
    bare?: boolean;
  }
}

export const routes: RouteRecordRaw[] = [
  // Owners, managers and buyers land on the stock board; workers on Home with their round (StartView picks).
  { path: '/', name: 'home', component: () => import('@/views/StartView.vue'), meta: { title: 'Home', roles: ROLES } },
  { path: '/round', name: 'round', component: () => import('@/views/RoundView.vue'), meta: { title: 'Round', roles: ['owner', 'manager', 'worker'] } },
  { path: '/imports', name: 'imports', component: () => import('@/views/ImportsView.vue'), meta: { title: 'Logger files', roles: ['owner', 'manager', 'worker'] } },
  {
    path: '/sign-in',
    name: 'sign-in',
    component: () => import('@/views/SignInView.vue'),
    meta: { title: 'Sign in', public: true, guestOnly: true, bare: true },
  },
  {
    path: '/set-password',
    name: 'set-password',
    component: () => import('@/views/SetPasswordView.vue'),
    meta: { title: 'Set your password', public: true, bare: true },
  },
  {
    path: '/first-owner',
    name: 'first-owner',
    component: () => import('@/views/FirstOwnerView.vue'),
    meta: { title: 'Set up this server', public: true, bare: true },
  },
  { path: '/farms', name: 'farms', component: () => import('@/views/FarmsView.vue'), meta: { title: 'Farms' } },
  { path: '/farms/:farmId(\\d+)', name: 'farm', component: () => import('@/views/FarmView.vue'), meta: { title: 'Farm' } },
  { path: '/tanks/:id(\\d+)', name: 'tank', component: () => import('@/views/TankView.vue'), meta: { title: 'Tank' } },
  { path: '/inputs', name: 'inputs', component: () => import('@/views/InputsView.vue'), meta: { title: 'Inputs', roles: ['owner', 'manager', 'buyer', 'worker'] } },
  { path: '/orders', name: 'orders', component: () => import('@/views/OrdersView.vue'), meta: { title: 'Orders', roles: ['owner', 'manager', 'buyer'] } },
  { path: '/suppliers', name: 'suppliers', component: () => import('@/views/SuppliersView.vue'), meta: { title: 'Suppliers', roles: ['owner', 'manager', 'buyer'] } },
  { path: '/brews', name: 'brews', component: () => import('@/views/BrewsView.vue'), meta: { title: 'Brews', roles: ['owner', 'manager', 'worker'] } },
  { path: '/flags', name: 'flags', component: () => import('@/views/FlagsView.vue'), meta: { title: 'Flags' } },
  { path: '/people', name: 'people', component: () => import('@/views/PeopleView.vue'), meta: { title: 'People', roles: ['owner'] } },
  // The server answers 404 where the outbox is off and shows each person their organisation's mail only.
  { path: '/outbox', name: 'outbox', component: () => import('@/views/OutboxView.vue'), meta: { title: 'Outbox', roles: ['owner', 'manager', 'buyer'] } },
  { path: '/profile', name: 'profile', component: () => import('@/views/ProfileView.vue'), meta: { title: 'Profile' } },
  { path: '/:pathMatch(.*)*', name: 'not-found', component: () => import('@/views/NotFoundView.vue'), meta: { title: 'Not found', public: true } },
];

/** A `redirect` query value that is safe to follow: a path inside this app, never another origin. */
export function safeRedirect(value: unknown): string {
  if (typeof value !== 'string' || !value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\')) return '/';
  return value;
}

/**
 * The app's router. The guard loads the session once and shapes what the UI offers; the server
 * decides what each person may actually read or change.
 */
export function createAppRouter(history: RouterHistory = createWebHistory(import.meta.env.BASE_URL)): Router {
  const router = createRouter({
    history,
    routes,
    scrollBehavior: (_to, _from, saved) => saved ?? { top: 0 },
  });

  router.beforeEach(async (to) => {
    const session = useSessionStore();
    if (!session.loaded) {
      // Unreachable server: carry on as signed out; the sign-in page shows why.
      await session.load().catch(() => undefined);
    }
    if (to.meta.public) {
      if (to.meta.guestOnly && session.user) return safeRedirect(to.query.redirect);
      return true;
    }
    if (!session.user) {
      return to.fullPath === '/' ? { name: 'sign-in' } : { name: 'sign-in', query: { redirect: to.fullPath } };
    }
    if (to.meta.roles && !to.meta.roles.includes(session.user.role)) return { name: 'home' };
    return true;
  });

  router.afterEach((to) => {
    if (typeof document !== 'undefined') document.title = to.meta.title ? `${to.meta.title} · Brimstock` : 'Brimstock';
  });

  return router;
}

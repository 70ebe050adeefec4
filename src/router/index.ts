import { createRouter, createWebHistory, type RouteLocationNormalized, type RouteRecordRaw, type Router, type RouterHistory } from 'vue-router';
import { ROLES, type Role } from '@shared/schemas';
import { i18n } from '@/i18n';
import { useSessionStore } from '@/stores/session';

declare module 'vue-router' {
  interface RouteMeta {
    /** Message key of the page's name shown in the browser tab (app.titles.*). */
    titleKey?: string;
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
  { path: '/', name: 'home', component: () => import('@/views/StartView.vue'), meta: { titleKey: 'app.titles.home', roles: ROLES } },
  { path: '/round', name: 'round', component: () => import('@/views/RoundView.vue'), meta: { titleKey: 'app.titles.round', roles: ['owner', 'manager', 'worker'] } },
  { path: '/imports', name: 'imports', component: () => import('@/views/ImportsView.vue'), meta: { titleKey: 'app.titles.imports', roles: ['owner', 'manager', 'worker'] } },
  {
    path: '/sign-in',
    name: 'sign-in',
    component: () => import('@/views/SignInView.vue'),
    meta: { titleKey: 'app.titles.signIn', public: true, guestOnly: true, bare: true },
  },
  {
    path: '/set-password',
    name: 'set-password',
    component: () => import('@/views/SetPasswordView.vue'),
    meta: { titleKey: 'app.titles.setPassword', public: true, bare: true },
  },
  {
    path: '/first-owner',
    name: 'first-owner',
    component: () => import('@/views/FirstOwnerView.vue'),
    meta: { titleKey: 'app.titles.firstOwner', public: true, bare: true },
  },
  { path: '/farms', name: 'farms', component: () => import('@/views/FarmsView.vue'), meta: { titleKey: 'app.titles.farms' } },
  { path: '/farms/:farmId(\\d+)', name: 'farm', component: () => import('@/views/FarmView.vue'), meta: { titleKey: 'app.titles.farm' } },
  { path: '/tanks/:id(\\d+)', name: 'tank', component: () => import('@/views/TankView.vue'), meta: { titleKey: 'app.titles.tank' } },
  { path: '/inputs', name: 'inputs', component: () => import('@/views/InputsView.vue'), meta: { titleKey: 'app.titles.inputs', roles: ['owner', 'manager', 'buyer', 'worker'] } },
  { path: '/orders', name: 'orders', component: () => import('@/views/OrdersView.vue'), meta: { titleKey: 'app.titles.orders', roles: ['owner', 'manager', 'buyer'] } },
  { path: '/suppliers', name: 'suppliers', component: () => import('@/views/SuppliersView.vue'), meta: { titleKey: 'app.titles.suppliers', roles: ['owner', 'manager', 'buyer'] } },
  { path: '/brews', name: 'brews', component: () => import('@/views/BrewsView.vue'), meta: { titleKey: 'app.titles.brews', roles: ['owner', 'manager', 'worker'] } },
  { path: '/flags', name: 'flags', component: () => import('@/views/FlagsView.vue'), meta: { titleKey: 'app.titles.flags' } },
  { path: '/people', name: 'people', component: () => import('@/views/PeopleView.vue'), meta: { titleKey: 'app.titles.people', roles: ['owner'] } },
  // The server answers 404 where the outbox is off and shows each person their organisation's mail only.
  { path: '/outbox', name: 'outbox', component: () => import('@/views/OutboxView.vue'), meta: { titleKey: 'app.titles.outbox', roles: ['owner', 'manager', 'buyer'] } },
  { path: '/profile', name: 'profile', component: () => import('@/views/ProfileView.vue'), meta: { titleKey: 'app.titles.profile' } },
  { path: '/:pathMatch(.*)*', name: 'not-found', component: () => import('@/views/NotFoundView.vue'), meta: { titleKey: 'app.titles.notFound', public: true } },
];

/** Names the browser tab after the route's page, in the screens' language. */
export function showPageTitle(route: RouteLocationNormalized): void {
  if (typeof document === 'undefined') return;
  const { t } = i18n.global;
  document.title = route.meta.titleKey ? t('app.titles.page', { page: t(route.meta.titleKey) }) : t('app.name');
}

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

  router.afterEach((to) => showPageTitle(to));

  return router;
}

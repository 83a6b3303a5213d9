/**
 * Client routes: one per app area, the account pages, the admin pages, the safety page and a
 * not-found page. Every route either is public or names the action it needs (from the permission
 * table in shared/auth); one guard sends signed-out visitors to sign-in and refuses the rest.
 */
import { createRouter, createWebHistory, type RouteLocationNormalized, type RouteLocationRaw, type RouteRecordRaw } from 'vue-router'
import type { Action } from '../shared/auth/permissions'
import { appAreas } from './navigation'
import { useSessionStore } from './stores/session'

declare module 'vue-router' {
  interface RouteMeta {
    /** Reachable without signing in. */
    public?: boolean
    /** The action needed to open the page; absent = any signed-in person. */
    action?: Action
    /** Title shown in the browser tab. */
    title?: string
  }
}

const areaAction = (name: string): Action => appAreas.find((area) => area.name === name)?.action ?? 'lab.read'

export const routes: RouteRecordRaw[] = [
  { path: '/', name: 'overview', component: () => import('./pages/OverviewPage.vue'), meta: { action: areaAction('overview') } },
  { path: '/cavities', name: 'cavities', component: () => import('./pages/cavities/CavitiesPage.vue'), meta: { action: areaAction('cavities'), title: 'Cavities' } },
  { path: '/cavities/:id', name: 'cavity', component: () => import('./pages/cavities/CavityPage.vue'), props: true, meta: { action: 'lab.read', title: 'Cavity' } },
  { path: '/tuning', name: 'tuning', component: () => import('./pages/tuning/TuningPage.vue'), meta: { action: areaAction('tuning'), title: 'Tuning' } },
  { path: '/tuning/:cavityId', name: 'tuning-cavity', component: () => import('./pages/tuning/TuningPage.vue'), props: true, meta: { action: areaAction('tuning'), title: 'Tuning' } },
  { path: '/planner', name: 'planner', component: () => import('./pages/planner/PlannerPage.vue'), meta: { action: areaAction('planner'), title: 'Lens planner' } },
  { path: '/planner/kit', name: 'planner-kit', component: () => import('./pages/planner/LensKitPage.vue'), meta: { action: 'lab.read', title: 'Lens kit' } },
  { path: '/planner/plans/:id', name: 'planner-plan', component: () => import('./pages/planner/PlanPage.vue'), props: true, meta: { action: 'lab.read', title: 'Lens plan' } },
  { path: '/planner/:cavityId', name: 'planner-cavity', component: () => import('./pages/planner/PlannerPage.vue'), props: true, meta: { action: areaAction('planner'), title: 'Lens planner' } },
  { path: '/history', name: 'history', component: () => import('./pages/history/HistoryPage.vue'), meta: { action: areaAction('history'), title: 'History' } },
  { path: '/history/:cavityId', name: 'history-cavity', component: () => import('./pages/history/HistoryPage.vue'), props: true, meta: { action: areaAction('history'), title: 'History' } },
  { path: '/compare', name: 'compare', component: () => import('./pages/compare/ComparePage.vue'), props: (to) => ({ a: typeof to.query.a === 'string' ? to.query.a : '', b: typeof to.query.b === 'string' ? to.query.b : '' }), meta: { action: 'lab.read', title: 'Comparison' } },
  { path: '/logbook', name: 'logbook', component: () => import('./pages/logbook/LogbookPage.vue'), meta: { action: areaAction('logbook'), title: 'Logbook' } },
  { path: '/analyses/:id', name: 'analysis', component: () => import('./pages/analyses/AnalysisPage.vue'), props: true, meta: { action: 'lab.read', title: 'Analysis' } },
  { path: '/admin', name: 'admin', component: () => import('./pages/admin/AdminPeoplePage.vue'), meta: { action: 'users.manage', title: 'People' } },
  { path: '/admin/tokens', name: 'admin-tokens', component: () => import('./pages/admin/AdminTokensPage.vue'), meta: { action: 'tokens.manageAll', title: 'API tokens' } },
  { path: '/admin/audit', name: 'admin-audit', component: () => import('./pages/admin/AdminAuditPage.vue'), meta: { action: 'audit.read', title: 'Audit log' } },
  { path: '/admin/deleted', name: 'admin-deleted', component: () => import('./pages/admin/AdminDeletedTracesPage.vue'), meta: { action: 'uploads.restore', title: 'Deleted traces' } },
  { path: '/admin/outbox', name: 'admin-outbox', component: () => import('./pages/admin/AdminOutboxPage.vue'), meta: { action: 'outbox.read', title: 'Outbox' } },
  { path: '/account/tokens', name: 'my-tokens', component: () => import('./pages/auth/MyTokensPage.vue'), meta: { action: 'tokens.manageOwn', title: 'My API tokens' } },
  { path: '/sign-in', name: 'sign-in', component: () => import('./pages/auth/SignInPage.vue'), meta: { public: true, title: 'Sign in' } },
  { path: '/forgot-password', name: 'forgot-password', component: () => import('./pages/auth/ForgotPasswordPage.vue'), meta: { public: true, title: 'Forgot password' } },
  { path: '/reset-password', name: 'reset-password', component: () => import('./pages/auth/ResetPasswordPage.vue'), meta: { public: true, title: 'New password' } },
  { path: '/accept-invitation', name: 'accept-invitation', component: () => import('./pages/auth/AcceptInvitationPage.vue'), meta: { public: true, title: 'Join Cavitrace' } },
  { path: '/not-allowed', name: 'forbidden', component: () => import('./pages/auth/ForbiddenPage.vue'), meta: { title: 'Not allowed' } },
  { path: '/safety', name: 'safety', component: () => import('./pages/SafetyPage.vue'), meta: { public: true, title: 'Safety' } },
  { path: '/:pathMatch(.*)*', name: 'not-found', component: () => import('./pages/NotFoundPage.vue'), meta: { public: true, title: 'Not found' } },
]

/** What the guard needs to know about the session. */
export interface GuardSession {
  signedIn: boolean
  can(action: Action): boolean
}

/** Where a navigation may go: `true`, or a redirect to sign-in or to the not-allowed page. */
export function guardRoute(to: Pick<RouteLocationNormalized, 'meta' | 'fullPath' | 'name' | 'query'>, session: GuardSession): true | RouteLocationRaw {
  if (to.name === 'sign-in' && session.signedIn) {
    const next = typeof to.query.next === 'string' && to.query.next.startsWith('/') && !to.query.next.startsWith('//') ? to.query.next : '/'
    return next
  }
  if (to.meta.public) return true
  if (!session.signedIn) return { name: 'sign-in', query: to.fullPath === '/' ? {} : { next: to.fullPath } }
  if (to.meta.action && !session.can(to.meta.action)) return { name: 'forbidden', query: { from: to.fullPath } }
  return true
}

export const router = createRouter({ history: createWebHistory(), routes })

router.beforeEach(async (to) => {
  const session = useSessionStore()
  try {
    // Re-asked at most once a minute, so a session that expired or was ended elsewhere leads to sign-in.
    await session.load({ maxAgeMs: 60_000 })
  } catch {
    // The server is unreachable: treat as signed out; the sign-in page says what went wrong.
  }
  return guardRoute(to, session)
})

router.afterEach((to) => {
  const label = to.meta.title
  document.title = label && to.name !== 'overview' ? `${label} · Cavitrace` : 'Cavitrace'
})

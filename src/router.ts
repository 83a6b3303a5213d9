/** Client routes: one per app area, the safety page, and a not-found page. */
import { createRouter, createWebHistory, type RouteRecordRaw } from 'vue-router'
import { appAreas } from './navigation'

const pendingAreas: RouteRecordRaw[] = appAreas
  .filter((area) => area.name !== 'overview')
  .map((area) => ({ path: area.path, name: area.name, component: () => import('./pages/AreaPendingPage.vue'), props: { areaName: area.name } }))

export const routes: RouteRecordRaw[] = [
  { path: '/', name: 'overview', component: () => import('./pages/OverviewPage.vue') },
  ...pendingAreas,
  { path: '/safety', name: 'safety', component: () => import('./pages/SafetyPage.vue') },
  { path: '/:pathMatch(.*)*', name: 'not-found', component: () => import('./pages/NotFoundPage.vue') },
]

export const router = createRouter({ history: createWebHistory(), routes })

router.afterEach((to) => {
  const label = to.name === 'not-found' ? 'Not found' : to.name === 'safety' ? 'Safety' : appAreas.find((area) => area.name === to.name)?.label
  document.title = label && to.name !== 'overview' ? `${label} · Cavitrace` : 'Cavitrace'
})

/**
 * The app's areas, as shown in the navigation. Each area is a route and names the action (from the
 * permission table in shared/auth) a person needs to see it; menus and route guards both read it.
 */
import type { Action } from '../shared/auth/permissions'

export interface AppArea {
  /** Route name. */
  name: string
  path: string
  label: string
  /** PrimeIcons class. */
  icon: string
  /** One sentence: what a user does here. */
  summary: string
  /** The action needed to see this area. */
  action: Action
}

export const appAreas: AppArea[] = [
  { name: 'overview', path: '/', label: 'Overview', icon: 'pi pi-home', summary: 'Every cavity at a glance: latest mode-match, finesse and target status.', action: 'lab.read' },
  { name: 'cavities', path: '/cavities', label: 'Cavities', icon: 'pi pi-circle', summary: 'Each cavity’s geometry, computed mode spectrum, eigenmode and targets.', action: 'lab.read' },
  { name: 'tuning', path: '/tuning', label: 'Tuning', icon: 'pi pi-sliders-h', summary: 'Drop a scope export and see every resonance fitted and labelled, with the trend of this session.', action: 'traces.upload' },
  { name: 'history', path: '/history', label: 'History', icon: 'pi pi-chart-line', summary: 'Mode-match, finesse and linewidth over weeks, and two analyses side by side.', action: 'lab.read' },
  { name: 'logbook', path: '/logbook', label: 'Logbook', icon: 'pi pi-book', summary: 'Cleaning, realignment and part changes, with traces attached as evidence.', action: 'lab.read' },
  { name: 'planner', path: '/planner', label: 'Lens planner', icon: 'pi pi-compass', summary: 'Lenses from the lab’s kit that put the laser’s beam into the cavity’s eigenmode.', action: 'lab.read' },
  { name: 'admin', path: '/admin', label: 'Admin', icon: 'pi pi-users', summary: 'People, roles, API tokens for lab scripts, and the audit log.', action: 'users.manage' },
]

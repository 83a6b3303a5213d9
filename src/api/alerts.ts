/** Typed calls for alert rules, watching a cavity, and the signed-in person's in-app notifications. */
import type { AlertKind, AlertSettings, AlertState, AppNotification, CavityAlerts, NotificationKind } from '../../shared/api/alertSchemas'
import { apiRequest } from './client'

export type { AlertKind, AlertSettings, AlertState, AppNotification, CavityAlerts, NotificationKind }

const enc = encodeURIComponent

export interface WatchAnswer {
  cavityId: string
  watching: boolean
  watcherCount: number
}

export function getCavityAlerts(cavityId: string, signal?: AbortSignal): Promise<CavityAlerts> {
  return apiRequest(`/cavities/${enc(cavityId)}/alerts`, { signal })
}

/** Both rules at once; null switches a rule off. */
export function setCavityAlerts(cavityId: string, settings: AlertSettings): Promise<CavityAlerts> {
  return apiRequest(`/cavities/${enc(cavityId)}/alerts`, { method: 'PUT', body: settings })
}

export function setWatching(cavityId: string, watching: boolean): Promise<WatchAnswer> {
  return apiRequest(`/cavities/${enc(cavityId)}/watch`, { method: watching ? 'PUT' : 'DELETE' })
}

export function listNotifications(query: { unread?: boolean; limit?: number } = {}, signal?: AbortSignal): Promise<{ notifications: AppNotification[]; unreadCount: number }> {
  const params = new URLSearchParams()
  if (query.unread !== undefined) params.set('unread', String(query.unread))
  if (query.limit !== undefined) params.set('limit', String(query.limit))
  const search = params.toString()
  return apiRequest(`/notifications${search ? `?${search}` : ''}`, { signal })
}

export function markNotificationRead(id: number): Promise<{ notification: AppNotification }> {
  return apiRequest(`/notifications/${id}/read`, { method: 'POST' })
}

export function markAllNotificationsRead(): Promise<{ updated: number }> {
  return apiRequest('/notifications/read-all', { method: 'POST' })
}

/**
 * The signed-in person's in-app notifications: the newest ones and the unread count, refreshed every
 * minute while the app is open (and on demand), with marking one or all as read.
 */
import { onScopeDispose, shallowRef, toValue, type MaybeRefOrGetter } from 'vue'
import { listNotifications, markAllNotificationsRead, markNotificationRead, type AppNotification } from '../api/alerts'
import type { ApiError } from '../api/client'
import { asApiError } from './useCavitraceLoader'

export function useNotifications(enabled: MaybeRefOrGetter<boolean>, options: { pollMs?: number; limit?: number } = {}) {
  const { pollMs = 60_000, limit = 30 } = options
  const notifications = shallowRef<AppNotification[]>([])
  const unreadCount = shallowRef(0)
  const error = shallowRef<ApiError | null>(null)
  let controller: AbortController | undefined

  async function refresh(): Promise<void> {
    if (!toValue(enabled)) {
      notifications.value = []
      unreadCount.value = 0
      return
    }
    controller?.abort()
    const mine = (controller = new AbortController())
    try {
      const answer = await listNotifications({ limit }, mine.signal)
      notifications.value = answer.notifications
      unreadCount.value = answer.unreadCount
      error.value = null
    } catch (caught) {
      if (!mine.signal.aborted) error.value = asApiError(caught)
    }
  }

  async function markRead(id: number): Promise<void> {
    try {
      const { notification } = await markNotificationRead(id)
      notifications.value = notifications.value.map((item) => (item.id === id ? notification : item))
      unreadCount.value = Math.max(0, unreadCount.value - 1)
    } catch (caught) {
      error.value = asApiError(caught)
    }
  }

  async function markAllRead(): Promise<void> {
    try {
      await markAllNotificationsRead()
      await refresh()
    } catch (caught) {
      error.value = asApiError(caught)
    }
  }

  const timer = setInterval(() => void refresh(), pollMs)
  onScopeDispose(() => {
    clearInterval(timer)
    controller?.abort()
  })
  void refresh()
  return { notifications, unreadCount, error, refresh, markRead, markAllRead }
}

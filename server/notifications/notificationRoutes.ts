/**
 * In-app notifications of the signed-in person (any role).
 *
 * GET  /api/notifications?unread=true&limit=100 → { notifications: AppNotification[], unreadCount }   newest first
 * POST /api/notifications/:id/read              → { notification }   (404 when it is not the caller's)
 * POST /api/notifications/read-all              → { updated }
 *
 * AppNotification = { id, kind: 'fraction_below_target' | 'finesse_drop' | '…_recovered', title, body,
 *   cavityId, analysisId, details: { value, threshold, medianFinesse?, dropPercent? }, createdAt, readAt }
 */
import { Router } from 'express'
import { z } from 'zod'
import { notificationQuerySchema } from '../../shared/api/alertSchemas'
import { requireActor } from '../auth/actor'
import { requireSignedIn } from '../auth/requirePermission'
import type { AppContext } from '../app'
import { HttpError } from '../http/errors'
import { countUnread, listNotifications, markAllRead, markRead } from './notificationRepository'

const notificationIdSchema = z.coerce.number().int().positive()

export function notificationRoutes(context: AppContext): Router {
  const { db } = context
  const router = Router()

  router.get('/notifications', requireSignedIn, async (req, res) => {
    const actor = requireActor(req)
    const query = notificationQuerySchema.parse(req.query)
    const [notifications, unreadCount] = await Promise.all([listNotifications(db, actor.id, query), countUnread(db, actor.id)])
    res.json({ notifications, unreadCount })
  })

  router.post('/notifications/read-all', requireSignedIn, async (req, res) => {
    res.json({ updated: await markAllRead(db, requireActor(req).id) })
  })

  router.post('/notifications/:id/read', requireSignedIn, async (req, res) => {
    const parsed = notificationIdSchema.safeParse(req.params.id)
    const notification = parsed.success ? await markRead(db, requireActor(req).id, parsed.data) : null
    if (!notification) throw new HttpError(404, 'notification_not_found', `No notification with id ${String(req.params.id)}.`)
    res.json({ notification })
  })

  return router
}

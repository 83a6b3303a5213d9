/** `GET /api/outbox`: mail caught by the development SMTP fake, for admins. Absent when capture is off. */
import { Router } from 'express'
import { z } from 'zod'
import type { Db } from '../db/knex'
import { requirePermission } from '../auth/requirePermission'
import { listOutbox } from './outboxData'

const outboxQuerySchema = z.object({ to: z.string().max(254).optional(), limit: z.coerce.number().int().min(1).max(500).default(200) })

export function outboxRoutes(db: Db): Router {
  const router = Router()
  router.get('/outbox', requirePermission('outbox.read'), async (req, res) => {
    const query = outboxQuerySchema.parse(req.query)
    res.json({ messages: await listOutbox(db, query) })
  })
  return router
}

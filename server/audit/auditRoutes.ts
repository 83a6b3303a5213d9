/** `GET /api/audit`: the security event log, newest first — admins only. */
import { Router } from 'express'
import { auditQuerySchema } from '../../shared/auth/schemas'
import { requirePermission } from '../auth/requirePermission'
import type { Db } from '../db/knex'
import { listAudit } from './auditData'

export function auditRoutes(db: Db): Router {
  const router = Router()
  router.get('/audit', requirePermission('audit.read'), async (req, res) => {
    res.json({ events: await listAudit(db, auditQuerySchema.parse(req.query)) })
  })
  return router
}

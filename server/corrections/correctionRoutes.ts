/**
 * Undoing a wrong upload: `DELETE /api/traces/:id`, `POST /api/traces/:id/move`, `PUT`/`DELETE
 * /api/analyses/:id/exclusion`; admins list `GET /api/deleted-traces` and `POST /api/traces/:id/restore`.
 */
import { Router } from 'express'
import { deleteTraceSchema, excludeAnalysisSchema, moveTraceSchema } from '../../shared/api/correctionSchemas'
import { requireActor } from '../auth/actor'
import { requirePermission } from '../auth/requirePermission'
import type { AppContext } from '../app'
import { parseId } from '../cavities/cavityRoutes'
import { deleteTrace, deletedTraces, excludeAnalysis, moveTrace, restoreDeletedTrace } from './correctionService'

export function correctionRoutes(context: AppContext): Router {
  const router = Router()

  router.delete('/traces/:id', requirePermission('uploads.correct'), async (req, res) => {
    const { reason } = deleteTraceSchema.parse(req.body ?? {})
    res.json(await deleteTrace(context, requireActor(req), parseId(req.params.id, 'trace'), reason))
  })

  router.post('/traces/:id/move', requirePermission('uploads.correct'), async (req, res) => {
    const { cavityId, reason } = moveTraceSchema.parse(req.body ?? {})
    res.status(202).json(await moveTrace(context, requireActor(req), parseId(req.params.id, 'trace'), cavityId, reason))
  })

  router.put('/analyses/:id/exclusion', requirePermission('uploads.correct'), async (req, res) => {
    const { reason } = excludeAnalysisSchema.parse(req.body ?? {})
    res.json({ analysis: await excludeAnalysis(context, requireActor(req), parseId(req.params.id, 'analysis'), reason) })
  })

  router.delete('/analyses/:id/exclusion', requirePermission('uploads.correct'), async (req, res) => {
    res.json({ analysis: await excludeAnalysis(context, requireActor(req), parseId(req.params.id, 'analysis'), null) })
  })

  router.get('/deleted-traces', requirePermission('uploads.restore'), async (_req, res) => {
    res.json({ traces: await deletedTraces(context) })
  })

  router.post('/traces/:id/restore', requirePermission('uploads.restore'), async (req, res) => {
    res.json({ trace: await restoreDeletedTrace(context, requireActor(req), parseId(req.params.id, 'trace')) })
  })

  return router
}

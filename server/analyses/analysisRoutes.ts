/**
 * `GET /api/analyses/:id` → `{ status, result, error, … }` with `result` in the command line's shape;
 * `GET /api/analyses/:id/fit-check` → does the trace look like its cavity?
 */
import { Router } from 'express'
import { requirePermission } from '../auth/requirePermission'
import type { AppContext } from '../app'
import { parseId } from '../cavities/cavityRoutes'
import { getAnalysis } from './analysisService'
import { checkFit } from './fitCheckService'

export function analysisRoutes(context: AppContext): Router {
  const router = Router()
  router.get('/analyses/:id', requirePermission('lab.read'), async (req, res) => {
    res.json(await getAnalysis(context.db, parseId(req.params.id, 'analysis')))
  })
  router.get('/analyses/:id/fit-check', requirePermission('lab.read'), async (req, res) => {
    res.json({ fitCheck: await checkFit(context.db, parseId(req.params.id, 'analysis')) })
  })
  return router
}

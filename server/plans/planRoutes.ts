/**
 * Mode-matching planner routes.
 *
 * POST   /api/cavities/:id/plan  PlanRequest   → PlanAnswer   (lab.read; computes, stores nothing)
 *   PlanRequest = { beam: { kind: 'waist', x: { waistRadiusMm, waistPositionMm, m2? }, y?, wavelengthNm? }
 *                       | { kind: 'measured', zMm[], radiusXMm[], radiusYMm?, radiusUncertaintyMm?, wavelengthNm? },
 *                   table: { laserToCavityMm, lensZonesMm: [from, to][], minSpacingMm?, positionStepMm? },
 *                   couplingTarget? (0.95), rankBy? ('robust' | 'coupling'), toleranceMm? (1), lensIds?, mapArrangement? }
 *   PlanAnswer = { cavity, beam, fits, target, kit: { used, left }, arrangements, ideal, couplingTarget, reachesTarget,
 *                  verdict, evaluated, warnings, pictures: { path, map }, computeMs }   (see shared/api/plannerSchemas.ts)
 *   Bad numbers → 400 invalid_input; a problem the optics refuses (zone outside the path, beam too large, empty kit,
 *   wavelength mismatch, a fit with no waist) → 422 with its code and a sentence.
 * GET    /api/cavities/:id/plans               → { cavityId, plans: SavedPlan[] }  (newest first, without pictures)
 * POST   /api/cavities/:id/plans { inputs: PlanRequest, lenses: [{ lensId | focalLengthMm, zMm }], note? }
 *                                              → 201 { plan }  (analyses.run; coupling and tolerance recomputed here)
 * GET    /api/plans/:id                        → { plan }  (with pictures)
 * DELETE /api/plans/:id                        → 204       (analyses.run; the author, a lead or an admin)
 * GET    /api/analyses/:id/mismatch-family?planId
 *                                              → MismatchFamilyAnswer (order-2 share → waist-size / position family;
 *                                                per-lens position tolerance of the newest saved plan, or planId's)
 */
import { Router } from 'express'
import { z } from 'zod'
import { planRequestSchema, planSaveSchema } from '../../shared/api/plannerSchemas'
import { requireActor } from '../auth/actor'
import { HttpError } from '../http/errors'
import { requirePermission } from '../auth/requirePermission'
import type { AppContext } from '../app'
import { parseId } from '../cavities/cavityRoutes'
import { getPlan, listPlans, mismatchForAnalysis, planForCavity, removePlan, savePlan } from './planService'

const mismatchQuerySchema = z.object({ planId: z.uuid({ error: 'planId must be a plan id' }).optional() })

export function planRoutes(context: AppContext): Router {
  const { db } = context
  const router = Router()

  // One running search per person (in this process): a new one cancels the one still running, whose client then
  // hears 409. A client that hangs up cancels its search too.
  const running = new Map<number, AbortController>()
  const limits = { maxTwoLensPlacements: context.config.PLANNER_MAX_PLACEMENTS, timeBudgetMs: context.config.PLANNER_TIME_BUDGET_SECONDS * 1000 }
  router.post('/cavities/:id/plan', requirePermission('lab.read'), async (req, res) => {
    const cavityId = parseId(req.params.id, 'cavity')
    const parsed = planRequestSchema.parse(req.body ?? {})
    const actorId = requireActor(req).id
    running.get(actorId)?.abort('replaced')
    const search = new AbortController()
    running.set(actorId, search)
    res.on('close', () => {
      if (!res.writableFinished) search.abort('hung up')
    })
    try {
      res.json(await planForCavity(db, cavityId, parsed, { limits, signal: search.signal }))
    } catch (error) {
      if (!search.signal.aborted) throw error
      if (search.signal.reason === 'replaced') throw new HttpError(409, 'search_replaced', 'A newer planner search of yours replaced this one (one search per person runs at a time).')
    } finally {
      if (running.get(actorId) === search) running.delete(actorId)
    }
  })

  router.get('/cavities/:id/plans', requirePermission('lab.read'), async (req, res) => {
    const cavityId = parseId(req.params.id, 'cavity')
    res.json({ cavityId, plans: await listPlans(db, cavityId) })
  })

  router.post('/cavities/:id/plans', requirePermission('plans.write'), async (req, res) => {
    const plan = await savePlan(db, parseId(req.params.id, 'cavity'), planSaveSchema.parse(req.body ?? {}), requireActor(req))
    res.status(201).json({ plan })
  })

  router.get('/plans/:id', requirePermission('lab.read'), async (req, res) => {
    res.json({ plan: await getPlan(db, parseId(req.params.id, 'plan')) })
  })

  router.delete('/plans/:id', requirePermission('plans.write'), async (req, res) => {
    await removePlan(db, parseId(req.params.id, 'plan'), requireActor(req))
    res.status(204).end()
  })

  router.get('/analyses/:id/mismatch-family', requirePermission('lab.read'), async (req, res) => {
    const { planId } = mismatchQuerySchema.parse(req.query)
    res.json(await mismatchForAnalysis(db, parseId(req.params.id, 'analysis'), planId))
  })

  return router
}

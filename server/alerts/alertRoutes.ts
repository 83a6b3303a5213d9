/**
 * Alert rules and watching, per cavity.
 *
 * GET    /api/cavities/:id/alerts → CavityAlerts                       (lab.read)
 * PUT    /api/cavities/:id/alerts { targetFundamentalFraction, finesseDropPercent } → CavityAlerts   (targets.write)
 *          targetFundamentalFraction: 0–1 or null; finesseDropPercent: percent below the cavity's 30-day median
 *          finesse (0–100, exclusive) or null. null switches a rule off (and forgets its breach).
 * PUT    /api/cavities/:id/watch  → { cavityId, watching: true, watcherCount }    (anyone signed in)
 * DELETE /api/cavities/:id/watch  → { cavityId, watching: false, watcherCount }
 *
 * CavityAlerts = { cavityId, settings: { targetFundamentalFraction, finesseDropPercent },
 *   states: [{ kind: 'fraction_below_target' | 'finesse_drop', breached, since, analysisId }],
 *   watching (the caller), watcherCount }
 *
 * A newly finished analysis that puts a rule into breach notifies every watcher once (in-app via
 * /api/notifications, and one e-mail per watcher and analysis); further breaching analyses do not,
 * until one meets the rule again. The finesse rule needs at least 3 done analyses in the 30 days
 * before the new one. Leads also get a weekly digest e-mail of all cavities (see weeklyDigest.ts).
 */
import { Router } from 'express'
import { alertSettingsSchema } from '../../shared/api/alertSchemas'
import { requireActor } from '../auth/actor'
import { requirePermission, requireSignedIn } from '../auth/requirePermission'
import type { AppContext } from '../app'
import { parseId } from '../cavities/cavityRoutes'
import { getCavityAlerts, setCavityAlerts, watchCavity } from './alertService'

export function alertRoutes(context: AppContext): Router {
  const { db } = context
  const router = Router()

  router.get('/cavities/:id/alerts', requirePermission('lab.read'), async (req, res) => {
    res.json(await getCavityAlerts(db, parseId(req.params.id, 'cavity'), requireActor(req).id))
  })

  router.put('/cavities/:id/alerts', requirePermission('targets.write'), async (req, res) => {
    res.json(await setCavityAlerts(db, parseId(req.params.id, 'cavity'), alertSettingsSchema.parse(req.body ?? {}), requireActor(req).id))
  })

  router.put('/cavities/:id/watch', requireSignedIn, async (req, res) => {
    res.json(await watchCavity(db, parseId(req.params.id, 'cavity'), requireActor(req).id, true))
  })

  router.delete('/cavities/:id/watch', requireSignedIn, async (req, res) => {
    res.json(await watchCavity(db, parseId(req.params.id, 'cavity'), requireActor(req).id, false))
  })

  return router
}

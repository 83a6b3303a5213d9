/**
 * Overview, CSV exports and comparison (everyone signed in may read: `lab.read`).
 *
 * GET /api/overview            → Overview = { generatedAt, windowDays: 30, cavities: OverviewRow[] } (non-archived, by name)
 *   OverviewRow = { cavityId, name, location, wavelengthNm,
 *     latest: { analysisId, createdAt, fundamentalFraction, finesse, linewidthHz } | null   (newest done analysis),
 *     fractionChange30d: latest fraction − the newest one at least 30 days old (or, lacking one, the oldest
 *                        within the 30 days); null without two points,
 *     sparkline: [{ t, fundamentalFraction }] (done analyses of the last 30 days, oldest first),
 *     targetFundamentalFraction, targetStatus: 'met' | 'below' | 'none' (none: no target or no analysis),
 *     finesseDropPercent, activeAlerts: ('fraction_below_target' | 'finesse_drop')[],
 *     lastMaintenance: { entryId, occurredAt, kind, kindLabel } | null, watchedByMe }
 * GET /api/overview.csv        → text/csv, one line per cavity (fractions 0–1, times ISO 8601)
 * GET /api/cavities/:id/history.csv?from&to&limit → text/csv of the same rows as /history (newest first)
 * GET /api/analyses/compare?a=ID&b=ID → Comparison = { a, b, difference }
 *   a, b = { analysisId, cavityId, cavityName, traceId, fileName, note, createdAt, fundamentalFraction, finesse,
 *            linewidthHz, fsrHz, fsrSeconds, misalignmentShare, mismatchShare, orders: { "0": share, … } }
 *   difference = b − a for fundamentalFraction, finesse, linewidthHz, fsrHz, misalignmentShare, mismatchShare,
 *                orders (per order, missing = 0), relative: { finesse, linewidthHz } ((b − a) / a)
 *   409 analysis_not_done when either has no result. Traces: GET /api/traces/:traceId/file, overlaid by the client.
 */
import { Router, type Response } from 'express'
import { z } from 'zod'
import { historyQuerySchema } from '../../shared/api/cavitySchemas'
import { listCavityHistory } from '../analyses/analysisRepository'
import { requireActor } from '../auth/actor'
import { requirePermission } from '../auth/requirePermission'
import type { AppContext } from '../app'
import { parseId } from '../cavities/cavityRoutes'
import { getCavity } from '../cavities/cavityService'
import { compareAnalyses } from './compareAnalyses'
import { buildOverview, historyCsv, overviewCsv } from './overviewService'

const compareQuerySchema = z.object({ a: z.string({ error: 'a must be an analysis id' }), b: z.string({ error: 'b must be an analysis id' }) })

function sendCsv(res: Response, fileName: string, csv: string): void {
  res.set({ 'Content-Type': 'text/csv; charset=utf-8', 'Content-Disposition': `attachment; filename="${fileName.replace(/[^A-Za-z0-9._-]+/g, '_')}"` })
  res.send(csv)
}

export function overviewRoutes(context: AppContext): Router {
  const { db } = context
  const router = Router()

  router.get('/overview', requirePermission('lab.read'), async (req, res) => {
    res.json(await buildOverview(db, requireActor(req).id))
  })

  router.get('/overview.csv', requirePermission('lab.read'), async (req, res) => {
    const overview = await buildOverview(db, requireActor(req).id)
    sendCsv(res, `cavitrace-overview-${overview.generatedAt.slice(0, 10)}.csv`, overviewCsv(overview))
  })

  router.get('/cavities/:id/history.csv', requirePermission('lab.read'), async (req, res) => {
    const cavity = await getCavity(db, parseId(req.params.id, 'cavity'))
    const rows = await listCavityHistory(db, cavity.id, historyQuerySchema.parse(req.query))
    sendCsv(res, `${cavity.name}-history.csv`, historyCsv(rows))
  })

  router.get('/analyses/compare', requirePermission('lab.read'), async (req, res) => {
    const query = compareQuerySchema.parse(req.query)
    res.json(await compareAnalyses(db, parseId(query.a, 'analysis'), parseId(query.b, 'analysis')))
  })

  return router
}

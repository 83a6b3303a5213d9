/** Cavity routes: list, create, read (with the computed card), edit, history, live events. */
import { Router } from 'express'
import { z } from 'zod'
import { cavityInputSchema, cavityPatchSchema, historyQuerySchema } from '../../shared/api/cavitySchemas'
import { listCavityHistory } from '../analyses/analysisRepository'
import { requirePermission } from '../auth/requirePermission'
import type { AppContext } from '../app'
import { HttpError } from '../http/errors'
import { createCavity, editCavity, getCavity, getCavityWithModel, listCavities } from './cavityService'

const idSchema = z.uuid({ error: 'is not a valid id' })

/** Parse a route id, answering 404 (not 500) for ids that cannot exist. */
export function parseId(value: unknown, what: string): string {
  const parsed = idSchema.safeParse(value)
  if (!parsed.success) throw new HttpError(404, `${what}_not_found`, `No ${what} with id ${String(value)}.`)
  return parsed.data
}

export function cavityRoutes(context: AppContext): Router {
  const { db, events } = context
  const router = Router()

  router.get('/cavities', requirePermission('lab.read'), async (req, res) => {
    res.json({ cavities: await listCavities(db, { includeArchived: req.query.archived === 'true' }) })
  })

  router.post('/cavities', requirePermission('cavities.write'), async (req, res) => {
    const cavity = await createCavity(db, cavityInputSchema.parse(req.body))
    res.status(201).json({ cavity })
  })

  router.get('/cavities/:id', requirePermission('lab.read'), async (req, res) => {
    res.json(await getCavityWithModel(db, parseId(req.params.id, 'cavity')))
  })

  router.patch('/cavities/:id', requirePermission('cavities.write'), async (req, res) => {
    const cavity = await editCavity(db, parseId(req.params.id, 'cavity'), cavityPatchSchema.parse(req.body))
    res.json({ cavity })
  })

  router.get('/cavities/:id/history', requirePermission('lab.read'), async (req, res) => {
    const cavityId = parseId(req.params.id, 'cavity')
    const analyses = await listCavityHistory(db, cavityId, historyQuerySchema.parse(req.query))
    // Only an empty answer needs telling apart "no analyses" from "no such cavity" (a frequently polled route).
    if (analyses.length === 0) await getCavity(db, cavityId)
    res.json({ cavityId, analyses })
  })

  // Server-sent events: status changes of this cavity's analyses, from any app instance or worker.
  router.get('/cavities/:id/events', requirePermission('lab.read'), async (req, res) => {
    const cavity = await getCavity(db, parseId(req.params.id, 'cavity'))
    res.writeHead(200, { 'Content-Type': 'text/event-stream', 'Cache-Control': 'no-cache, no-transform', Connection: 'keep-alive', 'X-Accel-Buffering': 'no' })
    res.write(`retry: 2000\n: listening to cavity ${cavity.id}\n\n`)
    const unsubscribe = events.subscribe(cavity.id, (event) => {
      res.write(`event: analysis\ndata: ${JSON.stringify(event)}\n\n`)
    })
    const keepAlive = setInterval(() => res.write(': keep-alive\n\n'), 20_000)
    req.on('close', () => {
      clearInterval(keepAlive)
      unsubscribe()
    })
  })

  return router
}

/** Trace routes: upload (multipart, one or several files), read, download, re-analyse. */
import { Router } from 'express'
import { analysisOptionsSchema, traceUploadFieldsSchema } from '../../shared/api/cavitySchemas'
import { listTraceAnalyses } from '../analyses/analysisService'
import { actorOf } from '../auth/actor'
import { requirePermission } from '../auth/requirePermission'
import type { AppContext } from '../app'
import { parseId } from '../cavities/cavityRoutes'
import { HttpError } from '../http/errors'
import { uploadLimits } from '../config'
import { receiveTraceFiles, uploadedFiles } from './receiveTraceFiles'
import { readTraceContent } from './traceRepository'
import { getTrace, queueAnalysis, uploadTraces } from './traceService'

export function traceRoutes(context: AppContext): Router {
  const { db, config } = context
  const router = Router()
  router.post('/cavities/:id/traces', requirePermission('traces.upload'), receiveTraceFiles(uploadLimits(config)), async (req, res) => {
    const cavityId = parseId(req.params.id, 'cavity')
    const { note, sampleIntervalSeconds } = traceUploadFieldsSchema.parse(req.body ?? {})
    const options = sampleIntervalSeconds === undefined ? {} : { sampleIntervalSeconds }
    const outcomes = await uploadTraces(context, cavityId, uploadedFiles(req), note, actorOf(req)?.id ?? null, options)
    res.status(202).json({ uploads: outcomes })
  })

  router.get('/traces/:id', requirePermission('lab.read'), async (req, res) => {
    const trace = await getTrace(db, parseId(req.params.id, 'trace'))
    res.json({ trace, analyses: await listTraceAnalyses(db, trace.id) })
  })

  router.get('/traces/:id/file', requirePermission('lab.read'), async (req, res) => {
    const trace = await getTrace(db, parseId(req.params.id, 'trace'))
    const content = await readTraceContent(db, trace.id)
    if (!content) throw new HttpError(404, 'trace_not_found', `No stored file for trace ${trace.id}.`)
    // Stored compressed; browsers and curl --compressed decompress it on the fly.
    // The name as given, UTF-8 in filename* (RFC 6266 / RFC 8187) with an ASCII fallback for old clients.
    res.attachment(trace.fileName)
    res.set({ 'Content-Type': 'text/plain; charset=utf-8', 'Content-Encoding': 'gzip' })
    res.send(content)
  })

  router.post('/traces/:id/analyses', requirePermission('analyses.run'), async (req, res) => {
    const trace = await getTrace(db, parseId(req.params.id, 'trace'))
    const options = analysisOptionsSchema.parse(req.body ?? {})
    const analysis = await queueAnalysis(context, trace, options, actorOf(req)?.id ?? null)
    res.status(202).json({ analysis })
  })

  return router
}

/** Trace routes: upload (multipart, one or several files), read, download, re-analyse. */
import { Router, type RequestHandler } from 'express'
import multer from 'multer'
import { analysisOptionsSchema, traceUploadFieldsSchema } from '../../shared/api/cavitySchemas'
import { listTraceAnalyses } from '../analyses/analysisService'
import { actorOf } from '../auth/actor'
import { requirePermission } from '../auth/requirePermission'
import type { AppContext } from '../app'
import { parseId } from '../cavities/cavityRoutes'
import { HttpError } from '../http/errors'
import { readTraceContent } from './traceRepository'
import { getTrace, queueAnalysis, uploadTraces } from './traceService'

const MAX_FILES = 20

export function traceRoutes(context: AppContext): Router {
  const { db, config } = context
  const router = Router()
  const limitBytes = Math.round(config.UPLOAD_LIMIT_MB * 1024 * 1024)
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: limitBytes, files: MAX_FILES, fields: 10 } }).array('file', MAX_FILES)

  // multer's own errors become house-style answers: 413 for size, 400 for the rest.
  const receiveFiles: RequestHandler = (req, res, next) => {
    upload(req, res, (error: unknown) => {
      if (!error) return next()
      if (error instanceof multer.MulterError) {
        if (error.code === 'LIMIT_FILE_SIZE') return next(new HttpError(413, 'file_too_large', `The file is larger than the upload limit of ${config.UPLOAD_LIMIT_MB} MB.`))
        if (error.code === 'LIMIT_UNEXPECTED_FILE') return next(new HttpError(400, 'unexpected_field', `Send files in the multipart field "file" (got "${error.field}").`))
        return next(new HttpError(400, 'bad_upload', `The upload was refused: ${error.message}.`))
      }
      next(error)
    })
  }

  router.post('/cavities/:id/traces', requirePermission('traces.upload'), receiveFiles, async (req, res) => {
    const cavityId = parseId(req.params.id, 'cavity')
    const { note } = traceUploadFieldsSchema.parse(req.body ?? {})
    const files = ((req.files as Express.Multer.File[] | undefined) ?? []).map((file) => ({ fileName: file.originalname || 'trace.csv', bytes: file.buffer }))
    const outcomes = await uploadTraces(context, cavityId, files, note, actorOf(req)?.id ?? null)
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
    res.set({ 'Content-Type': 'text/plain; charset=utf-8', 'Content-Encoding': 'gzip', 'Content-Disposition': `attachment; filename="${trace.fileName.replace(/["\\\r\n]/g, '_')}"` })
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

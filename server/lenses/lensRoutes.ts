/**
 * Lens-kit routes. Everyone signed in reads (`lab.read`); technicians, leads and admins edit (`lenses.write`).
 *
 * GET    /api/lenses                      → { lenses: Lens[] }   (shortest focal length first)
 * GET    /api/lenses.csv                  → text/csv, columns label, focal_length_mm, count, type, wavelength_min_nm,
 *                                           wavelength_max_nm, notes
 * POST   /api/lenses { label, focalLengthMm, count?, type?, wavelengthMinNm?, wavelengthMaxNm?, notes? } → 201 { lens }
 * POST   /api/lenses/import  multipart `file`, or the CSV as a text/csv body
 *                                         → { created, updated, lenses }  (a label already in the kit updates that lens;
 *                                           any bad line refuses the whole file: 422 invalid_csv naming each line)
 * PATCH  /api/lenses/:id { any field }    → { lens }
 * DELETE /api/lenses/:id                  → 204   (saved plans keep their own copy of the lenses they used)
 * Lens = { id, label, focalLengthMm, count, type, wavelengthMinNm, wavelengthMaxNm, notes, createdAt, updatedAt }
 */
import express, { Router, type RequestHandler } from 'express'
import multer from 'multer'
import { lensInputSchema, lensPatchSchema } from '../../shared/api/plannerSchemas'
import { requirePermission } from '../auth/requirePermission'
import type { AppContext } from '../app'
import { parseId } from '../cavities/cavityRoutes'
import { HttpError } from '../http/errors'
import { addLens, editLens, exportLensCsv, importLensCsv, listLenses, removeLens } from './lensService'

const CSV_LIMIT_BYTES = 1024 * 1024

export function lensRoutes(context: AppContext): Router {
  const { db } = context
  const router = Router()
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: CSV_LIMIT_BYTES, files: 1, fields: 5 } }).single('file')
  const receiveCsv: RequestHandler = (req, res, next) => {
    if (!req.is('multipart/form-data')) return express.text({ type: ['text/csv', 'text/plain', 'application/csv'], limit: CSV_LIMIT_BYTES })(req, res, next)
    upload(req, res, (error: unknown) => {
      if (!(error instanceof multer.MulterError)) return next(error)
      if (error.code === 'LIMIT_FILE_SIZE') return next(new HttpError(413, 'file_too_large', 'The CSV is larger than 1 MB; a lens kit is much smaller.'))
      next(new HttpError(400, 'bad_upload', `The upload was refused: ${error.message} (send the CSV in the multipart field "file").`))
    })
  }

  router.get('/lenses', requirePermission('lab.read'), async (_req, res) => {
    res.json({ lenses: await listLenses(db) })
  })

  router.get('/lenses.csv', requirePermission('lab.read'), async (_req, res) => {
    res.type('text/csv; charset=utf-8').attachment('lens-kit.csv').send(await exportLensCsv(db))
  })

  router.post('/lenses', requirePermission('lenses.write'), async (req, res) => {
    res.status(201).json({ lens: await addLens(db, lensInputSchema.parse(req.body ?? {})) })
  })

  router.post('/lenses/import', requirePermission('lenses.write'), receiveCsv, async (req, res) => {
    const file = req.file as Express.Multer.File | undefined
    const text = file ? file.buffer.toString('utf8') : typeof req.body === 'string' ? req.body : null
    if (text === null || text.trim() === '') {
      throw new HttpError(400, 'no_csv', 'Send the kit CSV as the multipart field "file" or as a text/csv body.')
    }
    res.json(await importLensCsv(db, text))
  })

  router.patch('/lenses/:id', requirePermission('lenses.write'), async (req, res) => {
    res.json({ lens: await editLens(db, parseId(req.params.id, 'lens'), lensPatchSchema.parse(req.body ?? {})) })
  })

  router.delete('/lenses/:id', requirePermission('lenses.write'), async (req, res) => {
    await removeLens(db, parseId(req.params.id, 'lens'))
    res.status(204).end()
  })

  return router
}

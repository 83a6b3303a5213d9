/**
 * Maintenance-log routes. Everyone signed in reads; technicians, leads and admins write
 * (`logbook.write`); an entry is changed or deleted by its author, a lead or an admin.
 *
 * GET    /api/log-kinds                      → { kinds: LogKind[] }            ({ key, label, builtIn }, in display order)
 * POST   /api/log-kinds { label }            → 201 { kind }                    (cavities.write: leads, admins; 409 kind_exists)
 * GET    /api/cavities/:id/log-entries?q&kind&from&to&limit
 *                                            → { cavityId, entries: LogEntry[] } newest first (ties: newest written
 *                                              first); `q` searches the text (case-insensitive), `kind` is one key or
 *                                              several comma-separated, from/to bound `occurredAt` (ISO 8601,
 *                                              inclusive), `limit` caps the list (1–1000, default 200)
 * GET    /api/log-entries?q&kind&from&to&limit&cavityId&archived
 *                                            → { entries: LogEntry[] } the whole lab in one list, same filters, order
 *                                              and `limit` (in all, not per cavity); `cavityId` keeps one cavity (404
 *                                              cavity_not_found if unknown, 400 if not a uuid); archived cavities only
 *                                              with `archived=true` (as GET /api/cavities), or when picked by id
 * POST   /api/cavities/:id/log-entries { occurredAt?, kind, text?, traceIds? }
 *                                            → 201 { entry }                   (traceIds: traces already stored for this cavity)
 * GET    /api/log-entries/:id                → { entry }
 * PATCH  /api/log-entries/:id { occurredAt?, kind?, text?, traceIds? } → { entry }  (traceIds replaces the links)
 * DELETE /api/log-entries/:id                → 204                             (the traces themselves stay)
 * POST   /api/log-entries/:id/traces  multipart `file` (one or more), optional field `note`
 *                                            → 202 { entry, uploads }          (uploads as from POST /api/cavities/:id/traces)
 *
 * LogEntry = { id, cavityId, cavityName, occurredAt, author: { id, name } | null, kind, kindLabel, text,
 *   traces: [{ id, fileName, note, uploadedAt, analysis: { id, status, fundamentalFraction } | null }],
 *   beforeAfter: { before: Figures | null, after: Figures | null,
 *                  change: { fundamentalFraction, finesse, linewidthHz } (after − before, null if a side is missing) },
 *   createdAt, updatedAt }
 * Figures = { analysisId, createdAt, fundamentalFraction, finesse, linewidthHz }: the nearest done analysis of the
 * cavity strictly before / after `occurredAt` (by the analysis time the history uses).
 */
import { Router } from 'express'
import { labLogEntryQuerySchema, logEntryInputSchema, logEntryPatchSchema, logEntryQuerySchema, logKindInputSchema } from '../../shared/api/logbookSchemas'
import { traceUploadFieldsSchema } from '../../shared/api/cavitySchemas'
import { requireActor } from '../auth/actor'
import { requirePermission } from '../auth/requirePermission'
import type { AppContext } from '../app'
import { parseId } from '../cavities/cavityRoutes'
import { uploadLimits } from '../config'
import { receiveTraceFiles, uploadedFiles } from '../traces/receiveTraceFiles'
import { addLogKind, createLogEntry, editLogEntry, getLogEntry, listLabLogEntries, listLogEntries, listLogKinds, removeLogEntry, uploadEntryTraces } from './logbookService'

export function logbookRoutes(context: AppContext): Router {
  const { db, config } = context
  const router = Router()

  router.get('/log-kinds', requirePermission('lab.read'), async (_req, res) => {
    res.json({ kinds: await listLogKinds(db) })
  })

  router.post('/log-kinds', requirePermission('cavities.write'), async (req, res) => {
    res.status(201).json({ kind: await addLogKind(db, logKindInputSchema.parse(req.body ?? {}), requireActor(req)) })
  })

  router.get('/cavities/:id/log-entries', requirePermission('lab.read'), async (req, res) => {
    const cavityId = parseId(req.params.id, 'cavity')
    res.json({ cavityId, entries: await listLogEntries(db, cavityId, logEntryQuerySchema.parse(req.query)) })
  })

  router.post('/cavities/:id/log-entries', requirePermission('logbook.write'), async (req, res) => {
    const entry = await createLogEntry(db, parseId(req.params.id, 'cavity'), logEntryInputSchema.parse(req.body ?? {}), requireActor(req))
    res.status(201).json({ entry })
  })

  // `/log-entries/:id` needs a second path segment, so it never answers for the bare list.
  router.get('/log-entries', requirePermission('lab.read'), async (req, res) => {
    res.json({ entries: await listLabLogEntries(db, labLogEntryQuerySchema.parse(req.query)) })
  })

  router.get('/log-entries/:id', requirePermission('lab.read'), async (req, res) => {
    res.json({ entry: await getLogEntry(db, parseId(req.params.id, 'log_entry')) })
  })

  router.patch('/log-entries/:id', requirePermission('logbook.write'), async (req, res) => {
    res.json({ entry: await editLogEntry(db, parseId(req.params.id, 'log_entry'), logEntryPatchSchema.parse(req.body ?? {}), requireActor(req)) })
  })

  router.delete('/log-entries/:id', requirePermission('logbook.write'), async (req, res) => {
    await removeLogEntry(db, parseId(req.params.id, 'log_entry'), requireActor(req))
    res.status(204).end()
  })

  router.post('/log-entries/:id/traces', requirePermission('logbook.write'), receiveTraceFiles(uploadLimits(config)), async (req, res) => {
    const id = parseId(req.params.id, 'log_entry')
    const { note } = traceUploadFieldsSchema.parse(req.body ?? {})
    const files = uploadedFiles(req)
    res.status(202).json(await uploadEntryTraces(context, id, files, note, requireActor(req)))
  })

  return router
}

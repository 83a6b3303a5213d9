/**
 * Payloads of the maintenance-log API (`/api/cavities/:id/log-entries`, `/api/log-entries`,
 * `/api/log-entries/:id`, `/api/log-kinds`), shared by server validation and client forms.
 */
import { z } from 'zod'

const isoDate = (name: string) => z.coerce.date({ error: `${name} must be a date (ISO 8601)` })
const traceId = z.uuid({ error: 'traceIds must hold trace ids' })

/** A new entry. `occurredAt` defaults to now; `traceIds` links traces already stored for the cavity. */
export const logEntryInputSchema = z
  .object({
    occurredAt: isoDate('occurredAt').optional(),
    kind: z.string().trim().min(1, 'kind must not be empty').max(60, 'kind must be at most 60 characters'),
    text: z.string().trim().max(10_000, 'text must be at most 10000 characters').default(''),
    traceIds: z.array(traceId).max(50, 'traceIds may hold at most 50 ids').default([]),
  })
  .strict()
export type LogEntryInput = z.infer<typeof logEntryInputSchema>

/** An edit: any of the fields; `traceIds`, when given, replaces the linked traces. */
export const logEntryPatchSchema = z
  .object({
    occurredAt: isoDate('occurredAt').optional(),
    kind: z.string().trim().min(1, 'kind must not be empty').max(60, 'kind must be at most 60 characters').optional(),
    text: z.string().trim().max(10_000, 'text must be at most 10000 characters').optional(),
    traceIds: z.array(traceId).max(50, 'traceIds may hold at most 50 ids').optional(),
  })
  .strict()
export type LogEntryPatch = z.infer<typeof logEntryPatchSchema>

/** List filters: free-text search in the text, one or more kinds (comma-separated), a date range. */
export const logEntryQuerySchema = z.object({
  q: z.string().trim().max(200, 'q must be at most 200 characters').optional(),
  kind: z
    .string()
    .max(600)
    .transform((value) => value.split(',').map((part) => part.trim()).filter(Boolean))
    .optional(),
  from: isoDate('from').optional(),
  to: isoDate('to').optional(),
  limit: z.coerce.number().int().min(1).max(1000).default(200),
})
export type LogEntryQuery = z.infer<typeof logEntryQuerySchema>

/**
 * Filters of the lab-wide list: those of one cavity's list, plus one cavity by id, and whether archived
 * cavities count (as `GET /api/cavities?archived=true`; a cavity picked by id always counts).
 */
export const labLogEntryQuerySchema = logEntryQuerySchema.extend({
  cavityId: z.uuid({ error: 'cavityId must be a cavity id (uuid)' }).optional(),
  archived: z
    .enum(['true', 'false'], { error: 'archived must be true or false' })
    .transform((value) => value === 'true')
    .default(false),
})
export type LabLogEntryQuery = z.infer<typeof labLogEntryQuerySchema>

/** A new kind of entry, added by a lead or admin. */
export const logKindInputSchema = z
  .object({ label: z.string().trim().min(2, 'label must be at least 2 characters').max(60, 'label must be at most 60 characters') })
  .strict()
export type LogKindInput = z.infer<typeof logKindInputSchema>

export interface LogKind {
  /** Stable key stored on entries, e.g. `mirror_change`. */
  key: string
  label: string
  builtIn: boolean
}

/** The figures of one done analysis as the log shows them. */
export interface LogFigures {
  analysisId: string
  createdAt: string
  fundamentalFraction: number | null
  finesse: number | null
  linewidthHz: number | null
}

/** The nearest done analyses before and after an entry, and after − before. */
export interface BeforeAfter {
  before: LogFigures | null
  after: LogFigures | null
  /** after − before per figure; null when either side (or the figure) is missing. */
  change: { fundamentalFraction: number | null; finesse: number | null; linewidthHz: number | null }
}

export interface LogEntryTrace {
  id: string
  fileName: string
  note: string
  uploadedAt: string
  /** Latest analysis of the trace (status and id), so the client can link or wait for it. */
  analysis: { id: string; status: string; fundamentalFraction: number | null } | null
}

export interface LogEntry {
  id: string
  cavityId: string
  /** The cavity's name now (not when the entry was written). */
  cavityName: string
  occurredAt: string
  author: { id: number; name: string } | null
  kind: string
  kindLabel: string
  text: string
  traces: LogEntryTrace[]
  beforeAfter: BeforeAfter
  createdAt: string
  updatedAt: string
}

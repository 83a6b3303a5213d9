/**
 * Undoing a wrong upload (issue 13): delete a trace, move it to another cavity, exclude an analysis from history,
 * trends and alerts. Payloads shared by server validation and client forms.
 */
import { z } from 'zod'

/** How long a deleted trace can be restored by an admin. */
export const RESTORE_DAYS = 30

const reason = z.string().trim().max(500, 'The reason must be at most 500 characters.')

/** `DELETE /api/traces/:id` (body optional). */
export const deleteTraceSchema = z.object({ reason: reason.default('') })

/** `POST /api/traces/:id/move`. */
export const moveTraceSchema = z.object({
  cavityId: z.uuid({ error: 'Choose the cavity to move the trace to.' }),
  reason: reason.default(''),
})

/** `PUT /api/analyses/:id/exclusion`: the reason is required, so the history says why a point is missing. */
export const excludeAnalysisSchema = z.object({
  reason: z.string().trim().min(3, 'Say in a few words why this analysis is excluded.').max(500, 'The reason must be at most 500 characters.'),
})

/** One row of `GET /api/deleted-traces` (admins). */
export interface DeletedTrace {
  id: string
  cavityId: string
  cavityName: string
  fileName: string
  uploadedAt: string
  deletedAt: string
  deletedByEmail: string | null
  reason: string
  /** Until when an admin can restore it. */
  restoreUntil: string
}

/** One figure of the fit check: what the trace measured against what the cavity leads one to expect. */
export interface FitFigure {
  measured: number
  expected: number
  /** measured / expected − 1. */
  relative: number
  /** True when the difference is beyond what the same cavity shows from scan to scan. */
  off: boolean
}

/**
 * `GET /api/analyses/:id/fit-check`: does this trace look like the cavity it was uploaded to? Gouy phase against the
 * geometry; FSR-to-sweep ratio and linewidth against the cavity's usual values (median of its other analyses).
 */
export interface FitCheck {
  analysisId: string
  cavityId: string
  cavityName: string
  gouy: FitFigure | null
  fsrToSweep: FitFigure | null
  linewidthHz: FitFigure | null
  /** How many earlier analyses of the cavity the usual values come from. */
  basedOn: number
  /** True when the trace plainly belongs to another geometry. */
  mismatch: boolean
  /** One sentence when `mismatch`, naming the cavity and the figures; null otherwise. */
  message: string | null
  /** Other cavities whose geometry fits the measured Gouy phase better, best first. */
  candidates: Array<{ cavityId: string; name: string; gouyOneWayRad: number }>
}

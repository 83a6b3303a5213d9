/**
 * Shapes the tuning-loop API answers with, shared by the server (which builds them) and the client
 * (which reads them).
 */
import type { AnalysisResult } from '../analysis/types'
import type { CavityGeometry } from '../cavity'
import type { AnalysisOptions, AnalysisStatus } from './cavitySchemas'

/** A stored upload (`GET /api/traces/:id`). The raw bytes are fetched separately. */
export interface TraceRecord {
  id: string
  cavityId: string
  sha256: string
  fileName: string
  sizeBytes: number
  note: string
  uploadedBy: number | null
  uploadedAt: string
}

/** An analysis (`GET /api/analyses/:id`). */
export interface AnalysisRecord {
  id: string
  traceId: string
  cavityId: string
  status: AnalysisStatus
  options: AnalysisOptions
  /** The geometry this analysis used, kept even when the cavity is edited later. */
  geometry: CavityGeometry
  result: AnalysisResult | null
  error: { code: string; message: string } | null
  attempts: number
  engineMs: number | null
  requestedBy: number | null
  createdAt: string
  startedAt: string | null
  finishedAt: string | null
  /** Set when someone excluded this analysis from history, trends and alerts (with why). */
  excluded: { at: string; by: number | null; reason: string } | null
  /** True when its trace was deleted (only an admin restoring it sees such an analysis). */
  deleted: boolean
}

/** One row of `GET /api/cavities/:id/history`, newest first. */
export interface HistoryRow {
  analysisId: string
  traceId: string
  createdAt: string
  fileName: string
  note: string
  status: AnalysisStatus
  fundamentalFraction: number | null
  /** The stated one-standard-error of the TEM00 fraction (null for failed or older analyses). */
  fundamentalFractionError: number | null
  finesse: number | null
  linewidthHz: number | null
  /** One line saying why the number is in doubt (see shared/api/resultTrust.ts); null when it can be trusted. */
  doubt: string | null
  /** Set when the analysis is excluded from trends and alerts. */
  excluded: { reason: string } | null
  /** Why a failed analysis failed. */
  error: string | null
}

/** One file's outcome in an upload answer (`POST /api/cavities/:id/traces` → 202 `{ uploads }`). */
export interface UploadOutcome {
  trace: TraceRecord
  analysis: AnalysisRecord
  /** False when the same file was already stored for the cavity: it links to that trace and its analysis. */
  created: boolean
}

/** A status change pushed by `GET /api/cavities/:id/events` (server-sent event `analysis`). */
export interface AnalysisEvent {
  type: 'analysis'
  cavityId: string
  analysisId: string
  traceId: string
  status: AnalysisStatus
  /** Set when a person corrected an upload (the pages reload their lists). */
  change?: 'deleted' | 'restored' | 'moved_away' | 'moved_in' | 'excluded' | 'included'
}

/** Shapes of the overview and comparison answers (`GET /api/overview`, `GET /api/analyses/compare`). */
import type { AlertKind } from './alertSchemas'

/** 'doubtful': the latest number is in doubt (shared/api/resultTrust.ts), so it neither meets nor misses the target. */
export type TargetStatus = 'met' | 'below' | 'doubtful' | 'none'

export interface SparkPoint {
  /** When the analysis was made (ISO 8601). */
  t: string
  fundamentalFraction: number
}

export interface OverviewRow {
  cavityId: string
  name: string
  location: string
  wavelengthNm: number
  latest: { analysisId: string; createdAt: string; fundamentalFraction: number | null; finesse: number | null; linewidthHz: number | null; fundamentalFractionError: number | null; doubt: string | null } | null
  /** Latest fraction − the fraction 30 days ago (see the overview routes for the rule); null without two points. */
  fractionChange30d: number | null
  /** Done analyses of the last 30 days, oldest first. */
  sparkline: SparkPoint[]
  targetFundamentalFraction: number | null
  targetStatus: TargetStatus
  finesseDropPercent: number | null
  /** Rules in breach right now. */
  activeAlerts: AlertKind[]
  lastMaintenance: { entryId: string; occurredAt: string; kind: string; kindLabel: string } | null
  watchedByMe: boolean
  /** The cavity's own place in the chart palette: its order of creation, so adding a cavity changes no colour. */
  colourSlot: number
}

export interface Overview {
  generatedAt: string
  windowDays: number
  cavities: OverviewRow[]
}

/** The figures of one analysis in a comparison. */
export interface ComparedAnalysis {
  analysisId: string
  cavityId: string
  cavityName: string
  traceId: string
  fileName: string
  note: string
  createdAt: string
  fundamentalFraction: number
  /** Stated one-standard-errors (null when the result has none): a change within about two of them is noise. */
  fundamentalFractionError: number | null
  finesse: number | null
  finesseError: number | null
  /** Standard error of each order's share, keyed like `orders` (from the line model; absent orders have none). */
  shareErrors: Record<string, number>
  linewidthHz: number | null
  fsrHz: number
  fsrSeconds: number | null
  misalignmentShare: number
  mismatchShare: number
  /** Carrier power share per transverse order standing out of the noise, keyed "0", "1", … */
  orders: Record<string, number>
  /** Summed share of the orders measured below the noise (0 for results stored before it was reported). */
  belowNoiseShare: number
}

export interface Comparison {
  a: ComparedAnalysis
  b: ComparedAnalysis
  /** b − a for each figure (null when either is missing); `relative` is (b − a) / a. */
  difference: {
    fundamentalFraction: number
    finesse: number | null
    linewidthHz: number | null
    fsrHz: number
    misalignmentShare: number
    mismatchShare: number
    /** Per order present in either; a missing order counts as 0. */
    orders: Record<string, number>
    belowNoiseShare: number
    relative: { finesse: number | null; linewidthHz: number | null }
  }
}

/** Pure helpers of the tuning page: which analyses make up "this session", and the change between traces. */

/** What the session trend needs of a history row. */
export interface SessionEntry {
  analysisId: string
  createdAt: string
  status: 'queued' | 'running' | 'done' | 'failed'
  fundamentalFraction: number | null
  /** Stated one-standard-error of the fraction. @default null */
  fundamentalFractionError?: number | null
  /** One-line reason when the number is in doubt. @default null */
  doubt?: string | null
  /** Set when the analysis is excluded from trends and alerts. @default null */
  excluded?: { reason: string } | null
}

export interface SessionOptions {
  /** A pause longer than this between two uploads starts a new session. @default 30 */
  gapMinutes?: number
}

/**
 * The session: the newest run of uploads with no pause longer than `gapMinutes` between neighbours, oldest first
 * (upload order). `rows` may come in any order; duplicates (same analysis id) are merged, the later entry in `rows`
 * winning. Scans from another day are never compared with today's.
 */
export function sessionEntries<T extends SessionEntry>(rows: readonly T[], options: SessionOptions = {}): T[] {
  const { gapMinutes = 30 } = options
  const byId = new Map<string, T>()
  for (const row of rows) byId.set(row.analysisId, row)
  const sorted = [...byId.values()].sort((a, b) => Date.parse(a.createdAt) - Date.parse(b.createdAt))
  let start = sorted.length - 1
  while (start > 0 && Date.parse(sorted[start].createdAt) - Date.parse(sorted[start - 1].createdAt) <= gapMinutes * 60_000) start -= 1
  return sorted.slice(Math.max(0, start))
}

/** Finished analyses with a TEM00 fraction that count (not excluded), in the same order. */
export function finishedEntries<T extends SessionEntry>(entries: readonly T[]): T[] {
  return entries.filter((entry) => entry.status === 'done' && entry.fundamentalFraction !== null && !entry.excluded)
}

export interface FractionChange {
  /** Change in percentage points (latest − previous). */
  points: number
  /** 'same' when the change is within the noise of the two stated errors (or under `samePoints` without them). */
  direction: 'up' | 'down' | 'same'
}

/**
 * Change of the TEM00 fraction from the previous finished trace to the latest, in percentage points. A change within
 * twice the combined stated errors (2σ, common practice), or under `samePoints` when no error is stated, reads as
 * "same": noise is not progress. Null when there is no previous trace.
 */
export function fractionChange(
  latest: number | null,
  previous: number | null,
  errors: { latest?: number | null; previous?: number | null } = {},
  samePoints = 0.05,
): FractionChange | null {
  if (latest === null || previous === null) return null
  const points = (latest - previous) * 100
  const noisePoints = Math.max(samePoints, 200 * Math.hypot(errors.latest ?? 0, errors.previous ?? 0))
  const direction = Math.abs(points) <= noisePoints ? 'same' : points > 0 ? 'up' : 'down'
  return { points, direction }
}

/** Bar scales the tuning page steps through: a full bar is this share of the carrier power. */
const BAR_SCALES = [0.1, 0.25, 0.5, 1]

/** The smallest scale that holds `share`, never below `current`: the bars keep one scale while the page is open. */
export function barScaleFor(share: number, current = BAR_SCALES[0]): number {
  const needed = BAR_SCALES.find((scale) => share <= scale) ?? 1
  return Math.max(needed, current)
}

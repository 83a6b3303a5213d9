/** Pure helpers of the tuning page: which analyses make up "this session", and the change between traces. */

/** What the session trend needs of a history row. */
export interface SessionEntry {
  analysisId: string
  createdAt: string
  status: 'queued' | 'running' | 'done' | 'failed'
  fundamentalFraction: number | null
}

export interface SessionOptions {
  /** Analyses created before the page was opened that still count, so the trend has a starting point. @default 5 */
  earlierCount?: number
}

/**
 * The session: every analysis created since the page was opened plus the last `earlierCount` before it,
 * oldest first (upload order). `rows` may come in any order; duplicates (same analysis id) are merged,
 * the later entry in `rows` winning.
 */
export function sessionEntries<T extends SessionEntry>(rows: readonly T[], openedAt: Date, options: SessionOptions = {}): T[] {
  const { earlierCount = 5 } = options
  const byId = new Map<string, T>()
  for (const row of rows) byId.set(row.analysisId, row)
  const sorted = [...byId.values()].sort((a, b) => Date.parse(a.createdAt) - Date.parse(b.createdAt))
  const opened = openedAt.getTime()
  const before = sorted.filter((row) => Date.parse(row.createdAt) < opened)
  const since = sorted.filter((row) => Date.parse(row.createdAt) >= opened)
  return [...before.slice(Math.max(0, before.length - earlierCount)), ...since]
}

/** Finished analyses with a TEM00 fraction, in the same order. */
export function finishedEntries<T extends SessionEntry>(entries: readonly T[]): T[] {
  return entries.filter((entry) => entry.status === 'done' && entry.fundamentalFraction !== null)
}

export interface FractionChange {
  /** Change in percentage points (latest − previous). */
  points: number
  direction: 'up' | 'down' | 'same'
}

/**
 * Change of the TEM00 fraction from the previous finished trace to the latest, in percentage points;
 * changes under `samePoints` read as "same". Null when there is no previous trace.
 */
export function fractionChange(latest: number | null, previous: number | null, samePoints = 0.05): FractionChange | null {
  if (latest === null || previous === null) return null
  const points = (latest - previous) * 100
  const direction = Math.abs(points) < samePoints ? 'same' : points > 0 ? 'up' : 'down'
  return { points, direction }
}

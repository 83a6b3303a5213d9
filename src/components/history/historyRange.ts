/** Date ranges of the history page: the 7/30/90-day presets and a custom range, as ISO 8601 bounds. */

export type RangePreset = '7d' | '30d' | '90d' | 'custom'

/** The presets offered, with their length in days. */
export const rangePresets: ReadonlyArray<{ key: Exclude<RangePreset, 'custom'>; label: string; days: number }> = [
  { key: '7d', label: '7 days', days: 7 },
  { key: '30d', label: '30 days', days: 30 },
  { key: '90d', label: '90 days', days: 90 },
]

/** A closed range of instants. */
export interface HistoryRange {
  from: Date
  to: Date
}

const DAY_MS = 86_400_000

/** The last `days` days up to `now` (a rolling window, so today's newest analysis is always inside). */
export function presetRange(days: number, now: Date = new Date()): HistoryRange {
  if (!Number.isFinite(days) || days <= 0) throw new RangeError(`days must be a positive number (got ${days})`)
  return { from: new Date(now.getTime() - days * DAY_MS), to: new Date(now.getTime()) }
}

/**
 * A custom range from two calendar days picked in the browser's time zone: from the start of the first
 * day to the end of the last (both days included). The days may be given in either order.
 */
export function customRange(firstDay: Date, lastDay: Date): HistoryRange {
  const [early, late] = firstDay.getTime() <= lastDay.getTime() ? [firstDay, lastDay] : [lastDay, firstDay]
  const from = new Date(early.getFullYear(), early.getMonth(), early.getDate(), 0, 0, 0, 0)
  const to = new Date(late.getFullYear(), late.getMonth(), late.getDate(), 23, 59, 59, 999)
  return { from, to }
}

/** The range as the API's query (`from`, `to` in ISO 8601). */
export function rangeQuery(range: HistoryRange): { from: string; to: string } {
  return { from: range.from.toISOString(), to: range.to.toISOString() }
}

/** Read a preset key from a route query value; anything else gives `fallback`. */
export function parsePreset(value: unknown, fallback: RangePreset = '30d'): RangePreset {
  return value === '7d' || value === '30d' || value === '90d' || value === 'custom' ? value : fallback
}

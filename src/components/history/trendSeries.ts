/**
 * Pure helpers of the history trend charts: which analyses become points, and where the maintenance-log
 * markers sit on the time axis (with their labels kept apart so neighbours do not overprint).
 */
import type { HistoryRow } from '../../../shared/api/tuningTypes'

/** The figures a trend chart can show. */
export type TrendMetric = 'fundamentalFraction' | 'finesse' | 'linewidthHz'

/** One chart's points, oldest first: x in Unix seconds (uPlot's time axis), y in display units. */
export interface TrendSeries {
  x: number[]
  y: number[]
  analysisIds: string[]
}

/** Display scale of each metric: TEM00 in percent, linewidth in MHz, finesse as is. */
export const metricScale: Record<TrendMetric, number> = { fundamentalFraction: 100, finesse: 1, linewidthHz: 1e-6 }

/** Done analyses with a value for `metric`, oldest first, scaled for display; excluded ones are left out. */
export function trendSeries(rows: readonly HistoryRow[], metric: TrendMetric): TrendSeries {
  const kept = rows
    .filter((row) => row.status === 'done' && !row.excluded && row[metric] !== null && Number.isFinite(row[metric]))
    .map((row) => ({ t: Date.parse(row.createdAt) / 1000, v: (row[metric] as number) * metricScale[metric], id: row.analysisId }))
    .sort((a, b) => a.t - b.t)
  return { x: kept.map((p) => p.t), y: kept.map((p) => p.v), analysisIds: kept.map((p) => p.id) }
}

/** What a marker needs of a log entry. */
export interface MarkerEntry {
  id: string
  occurredAt: string
  kindLabel: string
  text: string
}

/** A marker placed on the chart: its x (Unix seconds), pixel position, and the label row it was given. */
export interface PlacedMarker {
  entryId: string
  x: number
  px: number
  label: string
  text: string
  /** 0 = top row; a label that would overlap the previous one in its row moves down a row. */
  row: number
}

export interface MarkerPlacementOptions {
  /** Approximate width of a label in pixels per character. @default 6.5 */
  charWidthPx?: number
  /** Gap kept between labels in one row, in pixels. @default 6 */
  gapPx?: number
  /** Rows available; labels beyond them stay in the last row. @default 3 */
  maxRows?: number
}

/**
 * Markers of the entries inside [xMin, xMax] (Unix seconds), left to right, mapped to pixels by `toPx`.
 * Each label takes the first row where it does not overlap the label before it (greedy interval packing).
 */
export function placeMarkers(entries: readonly MarkerEntry[], xMin: number, xMax: number, toPx: (x: number) => number, options: MarkerPlacementOptions = {}): PlacedMarker[] {
  const { charWidthPx = 6.5, gapPx = 6, maxRows = 3 } = options
  const inside = entries
    .map((entry) => ({ entry, x: Date.parse(entry.occurredAt) / 1000 }))
    .filter(({ x }) => Number.isFinite(x) && x >= xMin && x <= xMax)
    .sort((a, b) => a.x - b.x)
  const rowEnds: number[] = []
  return inside.map(({ entry, x }) => {
    const px = toPx(x)
    const start = px + 3
    const width = entry.kindLabel.length * charWidthPx
    let row = rowEnds.findIndex((end) => start >= end + gapPx)
    if (row < 0) row = Math.min(rowEnds.length, maxRows - 1)
    rowEnds[row] = Math.max(rowEnds[row] ?? -Infinity, start + width)
    return { entryId: entry.id, x, px, label: entry.kindLabel, text: entry.text, row }
  })
}

/** The marker within `tolerancePx` of pixel `px` (the nearest), or null: what the pointer is over. */
export function markerAt(markers: readonly PlacedMarker[], px: number, tolerancePx = 5): PlacedMarker | null {
  let best: PlacedMarker | null = null
  for (const marker of markers) {
    const distance = Math.abs(marker.px - px)
    if (distance <= tolerancePx && (!best || distance < Math.abs(best.px - px))) best = marker
  }
  return best
}

/** The overview's sparklines: a small SVG path of TEM00 fraction over the last 30 days, drawn by us. */

export interface SparklinePoint {
  /** ISO 8601 time. */
  t: string
  fundamentalFraction: number
}

export interface SparklineOptions {
  /** @default 96 */
  width?: number
  /** @default 24 */
  height?: number
  /** Inner margin in pixels, so the stroke and end dot are not clipped. @default 2 */
  padPx?: number
  /** Fixed y range (fractions); by default the points' own range, at least 2 percentage points tall. */
  yRange?: [number, number]
  /** Fixed time range (ms since 1970); by default the points' own span. */
  tRange?: [number, number]
}

export interface Sparkline {
  /** SVG path data ("M x y L x y …"); empty with no points. */
  path: string
  /** Where the newest point sits, for an end dot; null with no points. */
  last: { x: number; y: number } | null
  /** Height of `target` in the same coordinates, or null when none / outside. */
  targetY: number | null
}

/** Path of the points (in any order: they are sorted by time), scaled into width × height with y up. */
export function sparklinePath(points: readonly SparklinePoint[], target: number | null = null, options: SparklineOptions = {}): Sparkline {
  const { width = 96, height = 24, padPx = 2 } = options
  const sorted = points
    .map((p) => ({ t: Date.parse(p.t), f: p.fundamentalFraction }))
    .filter((p) => Number.isFinite(p.t) && Number.isFinite(p.f))
    .sort((a, b) => a.t - b.t)
  if (sorted.length === 0) return { path: '', last: null, targetY: null }
  const fractions = sorted.map((p) => p.f)
  let [yLow, yHigh] = options.yRange ?? [Math.min(...fractions), Math.max(...fractions)]
  // A flat run would otherwise blow noise up to the full height: keep at least 2 points of span.
  if (yHigh - yLow < 0.02) {
    const mid = (yHigh + yLow) / 2
    yLow = mid - 0.01
    yHigh = mid + 0.01
  }
  const [tLow, tHigh] = options.tRange ?? [sorted[0].t, sorted[sorted.length - 1].t]
  const innerW = width - 2 * padPx
  const innerH = height - 2 * padPx
  const xOf = (t: number) => (tHigh > tLow ? padPx + ((t - tLow) / (tHigh - tLow)) * innerW : padPx + innerW / 2)
  const yOf = (f: number) => padPx + (1 - (f - yLow) / (yHigh - yLow)) * innerH
  const round = (v: number) => Math.round(v * 100) / 100
  const path = sorted.map((p, i) => `${i === 0 ? 'M' : 'L'}${round(xOf(p.t))} ${round(yOf(p.f))}`).join(' ')
  const end = sorted[sorted.length - 1]
  const targetY = target !== null && target >= yLow && target <= yHigh ? round(yOf(target)) : null
  return { path, last: { x: round(xOf(end.t)), y: round(yOf(end.f)) }, targetY }
}

/**
 * uPlot draws series that share one x array. Several cavities are measured at different times, so their
 * points are merged onto the union of all times, with null where a series has no point (the chart
 * bridges those gaps with `spanGaps`).
 */
export interface XYSeries {
  x: readonly number[]
  y: readonly number[]
}

/** [sorted union of x, then one y array per series with null where it has no point]. */
export function alignSeries(series: readonly XYSeries[]): [number[], ...(number | null)[][]] {
  for (const [i, s] of series.entries()) {
    if (s.x.length !== s.y.length) throw new RangeError(`series ${i} has ${s.x.length} x values but ${s.y.length} y values`)
  }
  const xs = [...new Set(series.flatMap((s) => s.x))].sort((a, b) => a - b)
  const column = new Map(xs.map((x, i) => [x, i]))
  const ys = series.map((s) => {
    const out: (number | null)[] = new Array(xs.length).fill(null)
    s.x.forEach((x, i) => (out[column.get(x)!] = s.y[i]))
    return out
  })
  return [xs, ...ys]
}

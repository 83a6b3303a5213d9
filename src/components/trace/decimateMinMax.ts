/** What `decimateMinMax` keeps: the chosen samples, in their original order. */
export interface DecimatedSeries {
  x: Float64Array
  y: Float64Array
  /** Index of each kept sample in the input, so other channels can be sampled at the same points. */
  indices: Uint32Array
}

export interface DecimateMinMaxOptions {
  /** First input index to consider. @default 0 */
  from?: number
  /** One past the last input index to consider. @default x.length */
  to?: number
}

/**
 * Min/max decimation for drawing: split the samples into `buckets` runs of equal length and keep, from
 * each run, its lowest and its highest sample (in time order). A line through the kept points covers
 * exactly the vertical extent a full-resolution line would on a screen `buckets` pixels wide, so narrow
 * resonances never vanish (common practice in oscilloscope and chart rendering). NaN samples are skipped;
 * a run with no finite sample keeps nothing. Ranges of at most 2 × buckets samples are kept whole.
 */
export function decimateMinMax(x: ArrayLike<number>, y: ArrayLike<number>, buckets: number, options: DecimateMinMaxOptions = {}): DecimatedSeries {
  const { from = 0, to = x.length } = options
  assertDecimateInput(x, y, buckets, from, to)
  const count = to - from
  if (count <= 2 * buckets) {
    const indices: number[] = []
    for (let i = from; i < to; i++) if (!Number.isNaN(y[i])) indices.push(i)
    return gather(x, y, indices)
  }
  const indices = new Uint32Array(2 * buckets)
  let kept = 0
  for (let b = 0; b < buckets; b++) {
    // Integer bucket edges spread the remainder evenly, so every sample lands in exactly one bucket.
    const start = from + Math.floor((b * count) / buckets)
    const end = from + Math.floor(((b + 1) * count) / buckets)
    let minIndex = -1
    let maxIndex = -1
    let minValue = Infinity
    let maxValue = -Infinity
    for (let i = start; i < end; i++) {
      const value = y[i]
      if (value < minValue) {
        minValue = value
        minIndex = i
      }
      if (value > maxValue) {
        maxValue = value
        maxIndex = i
      }
    }
    if (minIndex < 0) continue
    if (minIndex === maxIndex) {
      indices[kept++] = minIndex
    } else if (minIndex < maxIndex) {
      indices[kept++] = minIndex
      indices[kept++] = maxIndex
    } else {
      indices[kept++] = maxIndex
      indices[kept++] = minIndex
    }
  }
  return gather(x, y, indices.subarray(0, kept))
}

/** Values of another channel at the samples a decimation kept. */
export function sampleAt(values: ArrayLike<number>, indices: ArrayLike<number>): Float64Array {
  const out = new Float64Array(indices.length)
  for (let k = 0; k < indices.length; k++) out[k] = values[indices[k]]
  return out
}

/** Index range [from, to) of a sorted axis that covers [min, max], one sample wider on each side so lines reach the edges. */
export function indexRange(sortedX: ArrayLike<number>, min: number, max: number): { from: number; to: number } {
  const lower = lowerBound(sortedX, min)
  const upper = lowerBound(sortedX, max)
  return { from: Math.max(0, lower - 1), to: Math.min(sortedX.length, upper + 1) }
}

function lowerBound(sorted: ArrayLike<number>, value: number): number {
  let lo = 0
  let hi = sorted.length
  while (lo < hi) {
    const mid = (lo + hi) >>> 1
    if (sorted[mid] < value) lo = mid + 1
    else hi = mid
  }
  return lo
}

function gather(x: ArrayLike<number>, y: ArrayLike<number>, indices: ArrayLike<number>): DecimatedSeries {
  const kept = Uint32Array.from(indices)
  return { x: sampleAt(x, kept), y: sampleAt(y, kept), indices: kept }
}

function assertDecimateInput(x: ArrayLike<number>, y: ArrayLike<number>, buckets: number, from: number, to: number): void {
  if (x.length !== y.length) throw new RangeError(`x and y must have the same length (got ${x.length} and ${y.length})`)
  if (!Number.isInteger(buckets) || buckets < 1) throw new RangeError(`buckets must be a positive integer (got ${buckets})`)
  if (!Number.isInteger(from) || !Number.isInteger(to) || from < 0 || to > x.length || from > to) {
    throw new RangeError(`from and to must be indices with 0 <= from <= to <= ${x.length} (got ${from} and ${to})`)
  }
}

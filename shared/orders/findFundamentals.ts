/** A resonance position and size, as the TEM00 search needs it. */
export interface PeakPosition {
  /** Centre on any monotonic axis (samples or seconds). */
  center: number
  height: number
}

export interface FindFundamentalsOptions {
  /** Peaks at least this fraction of the tallest may be TEM00. @default 0.25 */
  tallFraction?: number
  /** Allowed change of one TEM00 spacing against the previous one (piezo nonlinearity). @default 0.3 */
  spacingTolerance?: number
}

export interface FundamentalComb {
  /** Indices (into the input) of the TEM00 resonances, in time order. */
  members: number[]
  /** FSR index of each member (0 for the first; a skipped resonance leaves a gap). */
  fsrIndex: number[]
  /** Set when two members alone fit one TEM00 and its order 1 as well (see ladderReading). */
  ladderPossible?: boolean
}

/**
 * Finds the TEM00 resonances as the tallest family of peaks repeating once per FSR: for every spacing seen
 * between tall peaks, a comb is walked from the tallest peak in both directions, each step taking the tallest
 * peak within the tolerance of the last spacing (so a nonlinear sweep is followed); the comb with the largest
 * summed height wins (common practice: TEM00 dominates a reasonably matched cavity).
 */
export function findFundamentals(peaks: PeakPosition[], options: FindFundamentalsOptions = {}): FundamentalComb {
  const { tallFraction = 0.25, spacingTolerance = 0.3 } = options
  if (peaks.length === 0) return { members: [], fsrIndex: [] }
  let tallest = 0
  for (let i = 1; i < peaks.length; i++) if (peaks[i].height > peaks[tallest].height) tallest = i
  const limit = tallFraction * peaks[tallest].height
  const tall = peaks.map((p, i) => i).filter((i) => peaks[i].height >= limit)
  const spacings = new Set<number>()
  for (const i of tall) {
    const d = Math.abs(peaks[i].center - peaks[tallest].center)
    if (d > 0) spacings.add(d)
  }
  let best: FundamentalComb = { members: [tallest], fsrIndex: [0] }
  let bestScore = peaks[tallest].height
  for (const spacing of spacings) {
    // The spacing from the tallest to the k-th tall peak may span several FSRs; try whole fractions of it.
    for (let divisor = 1; divisor <= 4; divisor++) {
      const comb = walkComb(peaks, tallest, spacing / divisor, limit, spacingTolerance)
      const sum = comb.members.reduce((s, i) => s + peaks[i].height, 0)
      // Every skipped FSR costs half an average member: a comb at half the true spacing, skipping every other
      // step, must not tie with the true one.
      const skipped = comb.fsrIndex[comb.fsrIndex.length - 1] - comb.fsrIndex[0] - (comb.members.length - 1)
      const score = sum - (0.5 * skipped * sum) / comb.members.length
      if (comb.members.length > 1 && score > bestScore * (1 + 1e-9)) {
        best = comb
        bestScore = score
      }
    }
  }
  return best
}

function walkComb(peaks: PeakPosition[], start: number, spacing: number, limit: number, tolerance: number): FundamentalComb {
  const forward = walk(peaks, start, spacing, limit, tolerance, 1)
  const backward = walk(peaks, start, spacing, limit, tolerance, -1)
  const startIndex = backward.steps.reduce((s, k) => s + k, 0)
  const members: number[] = []
  const fsrIndex: number[] = []
  let index = startIndex
  for (let k = 0; k < backward.members.length; k++) {
    index -= backward.steps[k]
    members.unshift(backward.members[k])
    fsrIndex.unshift(index)
  }
  members.push(start)
  fsrIndex.push(startIndex)
  index = startIndex
  for (let k = 0; k < forward.members.length; k++) {
    index += forward.steps[k]
    members.push(forward.members[k])
    fsrIndex.push(index)
  }
  return { members, fsrIndex }
}

/** Walks in one direction; each step may skip one missing resonance (step of two FSRs). */
function walk(peaks: PeakPosition[], start: number, spacing: number, limit: number, tolerance: number, sign: 1 | -1): { members: number[]; steps: number[] } {
  const members: number[] = []
  const steps: number[] = []
  let current = start
  let local = spacing
  for (;;) {
    let found = -1
    let stepCount = 0
    for (const multiple of [1, 2]) {
      const target = peaks[current].center + sign * multiple * local
      const halfWidth = tolerance * local * multiple
      let bestHeight = -Infinity
      for (let i = 0; i < peaks.length; i++) {
        const p = peaks[i]
        if (p.height < limit || Math.abs(p.center - target) > halfWidth) continue
        if (p.height > bestHeight) { bestHeight = p.height; found = i }
      }
      if (found >= 0) { stepCount = multiple; break }
    }
    if (found < 0) break
    const measured = Math.abs(peaks[found].center - peaks[current].center) / stepCount
    // Follow the local spacing slowly, so one misplaced peak cannot drag the comb off.
    local = 0.5 * local + 0.5 * measured
    members.push(found)
    steps.push(stepCount)
    current = found
  }
  return { members, steps }
}

import { EngineError } from '../errors'

/** One resonance found in a baseline-subtracted record (indices relative to that record). */
export interface ResonanceCandidate {
  /** Sample of the highest point. */
  peakIndex: number
  /** Window used to measure it: [startIndex, endIndex). */
  startIndex: number
  endIndex: number
  /** Highest sample above the baseline, volts. */
  maxV: number
  /** Number of separate maxima merged into this resonance (> 2 means ringing, dither or similar fast structure). */
  lobeCount: number
}

export interface FindResonancesOptions {
  /** Detection threshold in noise σ. @default max(5, √(2 ln n) + 1) */
  thresholdSigma?: number
  /** Runs above threshold closer than this many samples always merge. @default 2 */
  minGapSamples?: number
  /** A second maximum must stand out of the valley by this fraction of its own height to count as a resonance. @default 0.3 */
  valleyFraction?: number
}

/**
 * Finds resonances by significance over the noise (k·σ, not a fraction of the tallest peak), and groups the
 * samples of one resonance before anything is fitted, so that cavity ringing after a fast crossing
 * (Poirson et al., J. Opt. Soc. Am. B 14, 2811 (1997)), laser dither or detector low-pass cannot split it:
 * runs above threshold separated by less than their own width are one resonance, and a group showing three
 * or more maxima is fast structure of one resonance, not several resonances.
 */
export function findResonances(signalV: Float64Array, sigmaV: number, options: FindResonancesOptions = {}): ResonanceCandidate[] {
  const n = signalV.length
  const {
    thresholdSigma = Math.max(5, Math.sqrt(2 * Math.log(Math.max(n, 2))) + 1),
    minGapSamples = 2,
    valleyFraction = 0.3,
  } = options
  if (!(sigmaV > 0)) throw new EngineError('invalid_argument', `sigmaV must be greater than 0, got ${sigmaV}`)
  const threshold = thresholdSigma * sigmaV
  const runs = runsAbove(signalV, threshold)
  const groups = mergeRuns(runs, minGapSamples)
  const found: ResonanceCandidate[] = []
  for (const group of groups) {
    for (const candidate of splitGroup(signalV, group, sigmaV, thresholdSigma, valleyFraction)) found.push(candidate)
  }
  return found
}

interface Run {
  start: number
  end: number
}

function runsAbove(signalV: Float64Array, threshold: number): Run[] {
  const runs: Run[] = []
  let start = -1
  for (let i = 0; i < signalV.length; i++) {
    const above = signalV[i] > threshold
    if (above && start < 0) start = i
    if (!above && start >= 0) {
      runs.push({ start, end: i })
      start = -1
    }
  }
  if (start >= 0) runs.push({ start, end: signalV.length })
  return runs
}

/** Joins runs whose gap is shorter than the narrower of the two (fast structure) or than `minGap`. */
function mergeRuns(runs: Run[], minGap: number): Run[][] {
  const groups: Run[][] = []
  for (const run of runs) {
    const group = groups[groups.length - 1]
    if (group) {
      const last = group[group.length - 1]
      const gap = run.start - last.end
      const width = Math.min(run.end - run.start, last.end - last.start)
      if (gap <= minGap || gap < width) {
        group.push(run)
        continue
      }
    }
    groups.push([run])
  }
  return groups
}

function splitGroup(signalV: Float64Array, group: Run[], sigmaV: number, thresholdSigma: number, valleyFraction: number): ResonanceCandidate[] {
  const start = group[0].start
  const end = group[group.length - 1].end
  const maxima = prominentMaxima(signalV, start, end, sigmaV, thresholdSigma, valleyFraction)
  if (maxima.length !== 2) {
    // One maximum, or three and more (ringing lobes, dither): one resonance.
    let peakIndex = start
    for (let i = start; i < end; i++) if (signalV[i] > signalV[peakIndex]) peakIndex = i
    return [{ peakIndex, startIndex: start, endIndex: end, maxV: signalV[peakIndex], lobeCount: Math.max(1, maxima.length) }]
  }
  // Two resonances overlapping: cut at the valley between them.
  const [a, b] = maxima
  let valley = a
  for (let i = a; i <= b; i++) if (signalV[i] < signalV[valley]) valley = i
  return [
    { peakIndex: a, startIndex: start, endIndex: valley + 1, maxV: signalV[a], lobeCount: 1 },
    { peakIndex: b, startIndex: valley + 1, endIndex: end, maxV: signalV[b], lobeCount: 1 },
  ]
}

/**
 * Local maxima that rise out of the valley on each side by ≥ `valleyFraction` of their height and by the
 * detection threshold (a topographic-prominence test, common practice).
 */
function prominentMaxima(signalV: Float64Array, start: number, end: number, sigmaV: number, thresholdSigma: number, valleyFraction: number): number[] {
  const candidates: number[] = []
  for (let i = start; i < end; i++) {
    const left = i > start ? signalV[i - 1] : -Infinity
    const right = i + 1 < end ? signalV[i + 1] : -Infinity
    if (signalV[i] > left && signalV[i] >= right) candidates.push(i)
  }
  if (candidates.length <= 1) return candidates
  const kept: number[] = []
  for (const c of candidates) {
    const h = signalV[c]
    const need = Math.max(valleyFraction * h, thresholdSigma * sigmaV)
    // Walk to each side until something higher appears; the deeper of the two minimum climbs must exceed `need`.
    let leftMin = h
    let i = c - 1
    while (i >= start && signalV[i] <= h) { if (signalV[i] < leftMin) leftMin = signalV[i]; i-- }
    const leftOpen = i < start
    let rightMin = h
    let j = c + 1
    while (j < end && signalV[j] <= h) { if (signalV[j] < rightMin) rightMin = signalV[j]; j++ }
    const rightOpen = j >= end
    const leftDrop = leftOpen ? Infinity : h - leftMin
    const rightDrop = rightOpen ? Infinity : h - rightMin
    if (Math.min(leftDrop, rightDrop) >= need) kept.push(c)
  }
  return kept
}

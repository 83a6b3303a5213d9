import { EngineError } from '../errors'

/** One resonance found in a baseline-subtracted record (indices relative to that record). */
export interface ResonanceCandidate {
  /** Sample of the highest point. */
  peakIndex: number
  /** Samples belonging to the resonance: [startIndex, endIndex) (down to the valleys or the noise floor). */
  startIndex: number
  endIndex: number
  /** Highest sample above the baseline, volts. */
  maxV: number
  /** Number of separate maxima merged into this resonance (≥ 3 means ringing, dither or similar fast structure). */
  lobeCount: number
}

export interface FindResonancesOptions {
  /** A maximum must rise this many noise σ above the higher of its two valleys (its prominence). @default max(5, √(2 ln n) + 1) */
  thresholdSigma?: number
  /** Maxima closer than this many of their half-prominence widths are one resonance. @default 2 */
  mergeWidths?: number
  /** Longest walk, in samples, when measuring a prominence. @default max(200, n / 50) */
  maxWalk?: number
  /** Maxima closer than this many samples are always one resonance (e.g. a linewidth, once known). @default 0 */
  minSeparationSamples?: number
}

/**
 * Finds resonances by significance over the noise: every local maximum whose prominence (height above the
 * higher of the valleys separating it from taller ground) exceeds k·σ — not a fraction of the tallest peak.
 * Maxima closer together than about two of their own widths are then grouped as one resonance before anything
 * is fitted, so cavity ringing after a fast crossing (Poirson et al., J. Opt. Soc. Am. B 14, 2811 (1997)),
 * laser dither or detector low-pass cannot split one resonance into many.
 */
export function findResonances(signalV: Float64Array, sigmaV: number, options: FindResonancesOptions = {}): ResonanceCandidate[] {
  const n = signalV.length
  const {
    thresholdSigma = Math.max(5, Math.sqrt(2 * Math.log(Math.max(n, 2))) + 1),
    mergeWidths = 2,
    maxWalk = Math.max(200, Math.floor(n / 50)),
    minSeparationSamples = 0,
  } = options
  if (!(sigmaV > 0)) throw new EngineError('invalid_argument', `sigmaV must be greater than 0, got ${sigmaV}`)
  const minProminence = thresholdSigma * sigmaV
  const maxima: { index: number; prominence: number; halfWidth: number }[] = []
  for (let i = 0; i < n; i++) {
    const v = signalV[i]
    if (!(v > minProminence)) continue
    if (i > 0 && !(v > signalV[i - 1])) continue
    if (i + 1 < n && v < signalV[i + 1]) continue
    const prominence = prominenceAt(signalV, i, maxWalk, minProminence)
    if (prominence >= minProminence) maxima.push({ index: i, prominence, halfWidth: halfProminenceWidth(signalV, i, prominence, maxWalk) })
  }
  // Group maxima that sit within a couple of their own widths: structure inside one resonance.
  const groups: number[][] = []
  for (let k = 0; k < maxima.length; k++) {
    const group = groups[groups.length - 1]
    if (group) {
      const last = maxima[group[group.length - 1]]
      const width = Math.max(last.halfWidth, maxima[k].halfWidth)
      if (maxima[k].index - last.index <= Math.max(mergeWidths * width, minSeparationSamples)) {
        group.push(k)
        continue
      }
    }
    groups.push([k])
  }
  mergeRingingTails(groups, maxima, signalV)
  const found: ResonanceCandidate[] = []
  for (const group of groups) {
    let peakIndex = maxima[group[0]].index
    for (const k of group) if (signalV[maxima[k].index] > signalV[peakIndex]) peakIndex = maxima[k].index
    found.push({
      peakIndex,
      startIndex: maxima[group[0]].index,
      endIndex: maxima[group[group.length - 1]].index + 1,
      maxV: signalV[peakIndex],
      lobeCount: group.length,
    })
  }
  extendToValleys(signalV, found, sigmaV)
  return found
}

/**
 * A tall resonance followed (first within ten of its half-widths, then each step at most 1.5× the last) by two or
 * more ever-smaller maxima is ringing (a decaying beat after a fast crossing): the tail joins the resonance. A single follower may be a real mode and stays.
 */
function mergeRingingTails(groups: number[][], maxima: { index: number; halfWidth: number }[], s: Float64Array): void {
  for (let g = 0; g < groups.length; g++) {
    const top = groups[g].reduce((a, k) => (s[maxima[k].index] > s[maxima[a].index] ? k : a), groups[g][0])
    let previous = maxima[groups[g][groups[g].length - 1]].index
    let spacing = 10 * maxima[top].halfWidth
    let last = s[maxima[groups[g][groups[g].length - 1]].index]
    let end = g + 1
    while (end < groups.length && maxima[groups[end][0]].index - previous <= spacing) {
      const height = Math.max(...groups[end].map((k) => s[maxima[k].index]))
      // Ever smaller, allowing the beat to wobble a little from lobe to lobe.
      if (!(height < 1.5 * last && height < 0.5 * s[maxima[top].index])) break
      last = height
      // The beat period shortens as the detuning grows: the chain may continue at 1.5× the last step.
      spacing = 1.5 * (maxima[groups[end][0]].index - previous)
      previous = maxima[groups[end][groups[end].length - 1]].index
      end++
    }
    if (end - (g + 1) >= 2) {
      for (let h = g + 1; h < end; h++) groups[g].push(...groups[h])
      groups.splice(g + 1, end - (g + 1))
    }
  }
}

/**
 * Height above the higher of the lowest points met on each side before reaching higher ground. Both sides are
 * walked in step: when one side meets higher ground first, its lowest point already bounds the prominence from
 * above (prominence ≤ h − that side's low), so a noise maximum on a resonance's flank is rejected after a few
 * samples instead of a walk down the whole flank (the result is the same as walking both sides in full).
 */
function prominenceAt(s: Float64Array, i: number, maxWalk: number, minProminence: number): number {
  const h = s[i]
  const leftStop = Math.max(0, i - maxWalk)
  const rightStop = Math.min(s.length - 1, i + maxWalk)
  let leftMin = h
  let rightMin = h
  let j = i - 1
  let k = i + 1
  let leftOpen = j >= leftStop
  let rightOpen = k <= rightStop
  while (leftOpen || rightOpen) {
    if (leftOpen) {
      const v = s[j]
      if (v > h) {
        leftOpen = false
        if (h - leftMin < minProminence) return h - leftMin
      } else {
        if (v < leftMin) leftMin = v
        j--
        if (j < leftStop) leftOpen = false
      }
    }
    if (rightOpen) {
      const v = s[k]
      if (v > h) {
        rightOpen = false
        if (h - rightMin < minProminence) return h - rightMin
      } else {
        if (v < rightMin) rightMin = v
        k++
        if (k > rightStop) rightOpen = false
      }
    }
  }
  return h - Math.max(leftMin, rightMin)
}

/** Half the full width at half prominence, in samples (at least 0.5). */
function halfProminenceWidth(s: Float64Array, i: number, prominence: number, maxWalk: number): number {
  const level = s[i] - prominence / 2
  let a = i
  while (a > 0 && i - a < maxWalk && s[a - 1] > level) a--
  let b = i
  while (b + 1 < s.length && b - i < maxWalk && s[b + 1] > level) b++
  return Math.max(0.5, (b - a + 1) / 2)
}

/** Widens each resonance to its valleys with the neighbours, or to where it sinks into the noise. */
function extendToValleys(s: Float64Array, found: ResonanceCandidate[], sigmaV: number): void {
  for (let k = 0; k < found.length; k++) {
    const c = found[k]
    const leftLimit = k > 0 ? found[k - 1].endIndex : 0
    const rightLimit = k + 1 < found.length ? found[k + 1].startIndex : s.length
    let a = c.startIndex
    while (a - 1 >= leftLimit && s[a - 1] > sigmaV && s[a - 1] <= s[a] + sigmaV) a--
    let b = c.endIndex
    while (b < rightLimit && s[b] > sigmaV && s[b] <= s[b - 1] + sigmaV) b++
    c.startIndex = a
    c.endIndex = b
  }
}

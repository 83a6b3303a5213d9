import type { MeasuredResonance } from './measureResonances'
import { EngineError } from '../errors'
import { median } from '../numbers'

/** A resonance as found on the time axis (what foldFastStructure needs of it). */
export interface StructurePeak {
  tSeconds: number
  heightV: number
  widthSeconds: number
  areaVSeconds?: number
}

export interface FastStructure {
  /** Owner index for every input peak that is a lobe of an earlier, taller one (folded into it); absent for kept peaks. */
  ownerOf: Map<number, number>
  /** The structure's period in seconds (lobe spacing), or null when none was found. */
  periodSeconds: number | null
  /** Short words for the warning: 'ringing' (decaying lobes at a constant spacing). */
  kind: 'ringing' | null
}

export interface FoldFastStructureOptions {
  /** Noise rms of the signal the peaks were found on, volts. @default a fifth of the lowest peak (a finder's 5σ threshold) */
  sigmaV?: number
}

/** A lobe is at most this fraction of the peak before it in its chain (astigmatic split lines are about equal). */
const MAX_STEP_RATIO = 0.85
/** The first lobe is lower than its owner by at least this many noise σ. */
const MIN_DROP_SIGMA = 3
/** Lobes sit within this fraction of the period of their expected place. */
const SPACING_TOLERANCE = 0.12
/** The first lobe may sit this much further off: the owner's own top is shifted by the detector's lag. */
const FIRST_SPACING_TOLERANCE = 0.2
/** Lobes one after the other that may be lost in the noise without ending a chain. */
const MAX_MISSING_LOBES = 1
/** Longest chain walked (a ringing that lasts longer is no longer "fast structure"). */
const MAX_CHAIN_LOBES = 64
/** Share of the resonances tall enough to show a lobe that must own a chain. */
const MIN_OWNER_SHARE = 0.6
/** Fewest owners: one chain alone is no common spacing. */
const MIN_OWNERS = 2
/** Owners enough on their own, whatever share of the tall resonances they are (the finder may merge some lobes into their resonance). */
const MIN_CHAINS = 3
/** A lobe is a half-cycle of the oscillation: its FWHM is at least this fraction of the period (lines spaced many linewidths apart are not). */
const MIN_LOBE_WIDTH_OF_PERIOD = 0.08
/** The period must be this many times shorter than the median spacing of consecutive owners. */
const MIN_SPACING_OF_PERIOD = 4
/** A first lobe's height ratio may differ from the median one by this factor (one detector: one ratio). */
const FIRST_RATIO_SPREAD = 2
/** Lobes at least this wide relative to their owner might be lines of the same linewidth rather than half-cycles. */
const WIDE_LOBE_OF_OWNER = 0.8
/** Owners' heights within this factor of the next taller one belong to one group. */
const HEIGHT_CLASS_RATIO = 1.5
/** Spacing clusters tried, most populated first. */
const CANDIDATE_SPACINGS = 3

/**
 * Finds periodic fast structure after the resonances — a detector that rings (an under-damped second-order response
 * gives a decaying oscillation at one frequency after every sharp input, Ogata, "Modern Control Engineering", ch. 5),
 * or beats of like period — and folds each lobe into the resonance it follows, so that the lobes are not read as
 * transverse modes or as a comb.
 *
 * 1. Period: the gaps from each peak to its next one, when that one is clearly lower (≤ 0.85×), are clustered (the
 *    fullest ±12 % windows over the sorted gaps); up to three clusters, fullest first, give candidate periods g.
 * 2. Chains, for one g: each peak not yet folded, in time order, owns its next peak when that one sits at g (± 20 %:
 *    the owner's top is delayed by the response), is at most 0.85× its height and lower by 3 σ or more; then the peaks
 *    at each further g (± 12 %) that do not rise above the last lobe by more than the noise; one lobe may be lost in
 *    the noise. A response comes only after its cause: an owner with a peak of about its first lobe's height at the
 *    same spacing before it is two-sided structure (modulation sidebands, split orders, dither trains) and owns
 *    nothing. A linear detector gives every resonance the same first-lobe ratio: chains off the median by more than
 *    2× are not taken (a second walk).
 * 3. Acceptance, against a clean spectrum whose transverse orders also follow each TEM00 at one spacing, falling:
 *    - three or more owners, or two that are at least 60 % of the kept resonances tall enough to show a first lobe;
 *    - the lobes' median FWHM at least 0.08 g: a lobe is a half-cycle, wide for its period, while transverse orders are
 *      lines a linewidth wide spaced many linewidths apart;
 *    - lobes as wide as their owners (possibly lines of one linewidth, as in the ladder of a near-planar cavity) count
 *      only when owners of different heights (two groups 1.5× apart) all ring: a ladder has TEM00 owners only;
 *    - g at least 4× shorter than the median spacing of consecutive owners.
 * Sorting and binary searches only: O(n log n) for n peaks.
 */
export function foldFastStructure(peaks: StructurePeak[], options: FoldFastStructureOptions = {}): FastStructure {
  assertPeaks(peaks)
  const none: FastStructure = { ownerOf: new Map(), periodSeconds: null, kind: null }
  if (peaks.length < 3) return none
  let lowest = Infinity
  for (const p of peaks) lowest = Math.min(lowest, p.heightV)
  const sigmaV = options.sigmaV ?? lowest / 5
  if (!(sigmaV > 0) || !Number.isFinite(sigmaV)) throw new EngineError('invalid_argument', `sigmaV must be a finite number above 0, got ${String(options.sigmaV)}`)
  const order = peaks.map((_, i) => i).sort((a, b) => peaks[a].tSeconds - peaks[b].tSeconds)
  const times = order.map((i) => peaks[i].tSeconds)
  const heights = order.map((i) => peaks[i].heightV)
  // A lobe must stand out as a peak: at least what the finder could see.
  const floorV = Math.max(5 * sigmaV, lowest)
  for (const g of candidateSpacings(times, heights)) {
    const found = chainsAt(g, times, heights, order.map((i) => peaks[i].widthSeconds), sigmaV, floorV)
    if (!found) continue
    const ownerOf = new Map<number, number>()
    for (const [lobe, owner] of found.ownerOf) ownerOf.set(order[lobe], order[owner])
    return { ownerOf, periodSeconds: found.periodSeconds, kind: 'ringing' }
  }
  return none
}

/** Centres of the most populated clusters (±12 %) of gaps to a clearly lower next peak, in seconds. */
function candidateSpacings(times: number[], heights: number[]): number[] {
  const gaps: number[] = []
  for (let k = 0; k + 1 < times.length; k++) {
    const gap = times[k + 1] - times[k]
    if (gap > 0 && heights[k + 1] <= MAX_STEP_RATIO * heights[k]) gaps.push(gap)
  }
  gaps.sort((a, b) => a - b)
  const windows: { from: number; to: number }[] = []
  let to = 0
  for (let from = 0; from < gaps.length; from++) {
    if (to < from) to = from
    while (to + 1 < gaps.length && gaps[to + 1] <= gaps[from] * (1 + 2 * SPACING_TOLERANCE)) to++
    windows.push({ from, to })
  }
  windows.sort((a, b) => b.to - b.from - (a.to - a.from) || a.from - b.from)
  const chosen: { from: number; to: number }[] = []
  for (const w of windows) {
    if (w.to - w.from + 1 < MIN_OWNERS) break
    if (chosen.some((c) => w.from <= c.to && w.to >= c.from)) continue
    chosen.push(w)
    if (chosen.length === CANDIDATE_SPACINGS) break
  }
  return chosen.map((w) => median(gaps.slice(w.from, w.to + 1)))
}

interface Chain {
  owner: number
  lobes: number[]
  firstRatio: number
}

/**
 * Chains of lobes at spacing g over peaks sorted by time (indices into the sorted arrays), or null when they do not
 * pass the acceptance tests (see foldFastStructure).
 */
function chainsAt(g: number, times: number[], heights: number[], widths: number[], sigmaV: number, floorV: number): { ownerOf: Map<number, number>; periodSeconds: number } | null {
  const walk = (ratioRange: [number, number] | null) => {
    const lobeOf = new Int32Array(times.length).fill(-1)
    const chains: Chain[] = []
    for (let k = 0; k < times.length; k++) {
      if (lobeOf[k] >= 0) continue
      const chain = chainFrom(k, g, times, heights, sigmaV, lobeOf, ratioRange)
      if (!chain) continue
      for (const lobe of chain.lobes) lobeOf[lobe] = k
      chains.push(chain)
    }
    return { chains, lobeOf }
  }
  const first = walk(null)
  if (first.chains.length < MIN_OWNERS) return null
  const ratio = median(first.chains.map((c) => c.firstRatio))
  const { chains, lobeOf } = walk([ratio / FIRST_RATIO_SPREAD, Math.min(MAX_STEP_RATIO, ratio * FIRST_RATIO_SPREAD)])
  if (chains.length < MIN_OWNERS) return null
  // Kept resonances tall enough for their first lobe to stand clearly out of the noise.
  let tall = 0
  for (let k = 0; k < times.length; k++) if (lobeOf[k] < 0 && heights[k] * ratio >= 1.5 * floorV) tall++
  if (chains.length < MIN_CHAINS && chains.length < MIN_OWNER_SHARE * tall) return null
  const lobes = chains.flatMap((c) => c.lobes)
  if (median(lobes.map((k) => widths[k])) < MIN_LOBE_WIDTH_OF_PERIOD * g) return null
  // Lobes as wide as their owners could be lines of the same linewidth, e.g. a transverse ladder of a near-planar
  // cavity (orders ψ/π FSR apart, falling in power): then resonances of different heights must ring alike.
  if (median(chains.flatMap((c) => c.lobes.map((k) => widths[k] / Math.max(widths[c.owner], Number.MIN_VALUE)))) >= WIDE_LOBE_OF_OWNER && heightClasses(chains.map((c) => heights[c.owner])) < 2) return null
  // Owners are in time order (chains are started in time order).
  if (median(chains.slice(1).map((c, j) => times[c.owner] - times[chains[j].owner])) < MIN_SPACING_OF_PERIOD * g) return null
  // The period from the lobe-to-lobe steps (the owner's own top is shifted by the response); first steps without any.
  const steps: number[] = []
  const firstSteps: number[] = []
  for (const c of chains) {
    firstSteps.push(times[c.lobes[0]] - times[c.owner])
    for (let j = 1; j < c.lobes.length; j++) {
      const gap = times[c.lobes[j]] - times[c.lobes[j - 1]]
      steps.push(gap / Math.max(1, Math.round(gap / g)))
    }
  }
  const ownerOf = new Map<number, number>()
  for (const c of chains) for (const lobe of c.lobes) ownerOf.set(lobe, c.owner)
  return { ownerOf, periodSeconds: median(steps.length ? steps : firstSteps) }
}

/**
 * The lobes after peak k at g, 2g, … (sorted indices), each the peak nearest its expected place among the not yet
 * folded ones clearly lower than the lobe before; null when there is none, or when the structure is two-sided.
 */
function chainFrom(k: number, g: number, times: number[], heights: number[], sigmaV: number, lobeOf: Int32Array, ratioRange: [number, number] | null): Chain | null {
  const lobes: number[] = []
  let last = k
  let expected = times[k] + g
  let missing = 0
  while (lobes.length < MAX_CHAIN_LOBES) {
    const tolerance = (lobes.length === 0 ? FIRST_SPACING_TOLERANCE : SPACING_TOLERANCE) * g
    // The first lobe clearly lower than its owner; later ones not rising (lobes near the floor scatter with the noise).
    const allowed = lobes.length === 0 ? MAX_STEP_RATIO * heights[k] : heights[last] + 3 * sigmaV
    let best = -1
    for (let j = lowerBound(times, expected - tolerance); j < times.length && times[j] <= expected + tolerance; j++) {
      if (j <= last || lobeOf[j] >= 0 || heights[j] > allowed) continue
      if (best < 0 || Math.abs(times[j] - expected) < Math.abs(times[best] - expected)) best = j
    }
    if (best >= 0) {
      if (lobes.length === 0) {
        // The first lobe is the owner's next peak, lower by more than the noise could make it.
        if (best !== k + 1 || heights[k] - heights[best] < MIN_DROP_SIGMA * sigmaV) return null
        const r = heights[best] / heights[k]
        if (ratioRange && (r < ratioRange[0] || r > ratioRange[1])) return null
      }
      lobes.push(best)
      last = best
      expected = times[best] + g
      missing = 0
    } else if (lobes.length > 0 && missing < MAX_MISSING_LOBES) {
      expected += g
      missing++
    } else break
  }
  if (lobes.length === 0) return null
  const firstGap = times[lobes[0]] - times[k]
  const firstHeight = heights[lobes[0]]
  // Two-sided: a peak of about the first lobe's height at the same spacing before the owner.
  const before = times[k] - firstGap
  const reach = SPACING_TOLERANCE * g
  for (let j = lowerBound(times, before - reach); j < k && times[j] <= before + reach; j++) {
    if (heights[j] >= 0.5 * firstHeight && heights[j] <= 2 * firstHeight) return null
  }
  return { owner: k, lobes, firstRatio: firstHeight / heights[k] }
}

/** Groups of at least two owners whose heights lie within 1.5× of each other (the next group starts below). */
function heightClasses(ownerHeights: number[]): number {
  const sorted = ownerHeights.slice().sort((x, y) => y - x)
  let classes = 0
  let size = 1
  for (let j = 1; j <= sorted.length; j++) {
    if (j < sorted.length && sorted[j] >= sorted[j - 1] / HEIGHT_CLASS_RATIO) {
      size++
      continue
    }
    if (size >= 2) classes++
    size = 1
  }
  return classes
}

/** First index whose value is ≥ x in an ascending array. */
function lowerBound(values: number[], x: number): number {
  let lo = 0
  let hi = values.length
  while (lo < hi) {
    const mid = (lo + hi) >> 1
    if (values[mid] < x) lo = mid + 1
    else hi = mid
  }
  return lo
}

function assertPeaks(peaks: StructurePeak[]): void {
  peaks.forEach((p, i) => {
    if (!Number.isFinite(p.tSeconds) || !Number.isFinite(p.heightV) || !Number.isFinite(p.widthSeconds)) {
      throw new EngineError('invalid_argument', `peak ${i} must have finite tSeconds, heightV and widthSeconds`)
    }
    if (!(p.heightV > 0)) throw new EngineError('invalid_argument', `peak ${i} must have heightV above 0, got ${p.heightV}`)
    if (p.widthSeconds < 0) throw new EngineError('invalid_argument', `peak ${i} must have widthSeconds of 0 or more, got ${p.widthSeconds}`)
  })
}

/** The resonances less the lobes of fast structure, each lobe's area added to the resonance it follows. */
export function foldLobes(found: MeasuredResonance[], ownerOf: Map<number, number>): MeasuredResonance[] {
  const extra = new Map<number, number>()
  for (const [lobe, owner] of ownerOf) extra.set(owner, (extra.get(owner) ?? 0) + found[lobe].areaVSamples)
  return found.flatMap((m, i) => (ownerOf.has(i) ? [] : [{ ...m, areaVSamples: m.areaVSamples + (extra.get(i) ?? 0) }]))
}

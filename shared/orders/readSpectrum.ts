import { calibrateSweep, frequencyAt, type SweepCalibration } from '../calibration/calibrateSweep'
import { frac, median } from '../numbers'
import { calibrateFromChains, spacingOf, straightSweep } from './reading/calibrateFromChains'
import { chainsFrom, linkFamilies, periodCandidates, type Link } from './reading/periodCandidates'
import { hypotheses, missingLineCost, type Hypothesis } from './reading/scoreReadings'
import { familiesFrom, markOrphans, markSatellites, type Family } from './reading/spectrumFamilies'

/** A resonance found in the trace, as the reading needs it. */
export interface SpectrumPeak {
  tSeconds: number
  heightV: number
  /** Full width at half maximum on the time axis. */
  widthSeconds: number
}

export interface ReadSpectrumOptions {
  /** One-way Gouy phase the geometry predicts, rad: a prior, not a constraint. */
  predictedGouyRad: number
  /** Noise σ of one sample, volts. */
  sigmaV: number
  /** Highest transverse order used to explain a family. @default 8 */
  maxOrder?: number
  /** Relative width of the Gouy prior (one standard deviation of ψ/ψ_predicted). @default 0.1 */
  gouyPriorWidth?: number
  /** Readings returned, best first. @default 4 */
  keep?: number
  /** Modulation sidebands at ± this (FSR units) beside every carrier, or null. @default null */
  sidebandOffsetFsr?: number | null
  /** Time span of the sweep analysed, seconds (predicted lines inside it are expected). @default the peaks' span */
  startSeconds?: number
  endSeconds?: number
  /**
   * The tallest comb of resonances (indices into the peaks, with their FSR index): its spacing is tried as a period
   * as well, calibrated on the comb, with family heights allowed to vary. @default none
   */
  comb?: { members: number[]; fsrIndex: number[] }
  /** Sweep directions considered (one when the lab knows it). @default ['up', 'down'] */
  directions?: ('up' | 'down')[]
}

/** One way of reading the resonances as a cavity's spectrum. */
export interface SpectrumReading {
  /** Time → optical frequency in FSR units, TEM00 at whole numbers, rising with time. */
  calibration: SweepCalibration
  /** 'up': order N sits N·ψ/π FSR after its TEM00 in time; 'down': before. */
  direction: 'up' | 'down'
  /** One-way Gouy phase this reading implies, rad. */
  gouyRad: number
  /** Indices of the TEM00 resonances, in time order, with their FSR index (first = 0). */
  fundamentals: number[]
  fsrIndex: number[]
  /** Order given to each input peak (null: left unexplained; −1: a modulation sideband). */
  orders: (number | null)[]
  /** Cost of the reading (smaller is better): unexplained height, families' height scatter, orders used, Gouy prior. */
  cost: number
  /** TEM00 fraction by the families' mean heights (a quick figure; the line model measures it properly). */
  roughFraction: number
  /** Period of the pattern, seconds (median over the pairs that set it). */
  periodSeconds: number
  /** Families (chains of one resonance per FSR) that calibrated the sweep, and how many links they hold. */
  calibratingLinks: number
  /**
   * Offset of the twin every resonance shows when the laser runs on two longitudinal modes, FSR units on the optical
   * axis (signed: above its partner when positive), or null.
   */
  satelliteOffsetFsr: number | null
}

/**
 * Reads a swept-cavity spectrum from its resonances without assuming that TEM00 is the tallest. The sweep is
 * calibrated from the periodicity of the whole pattern — every family of resonances that repeats one FSR later
 * with the same height, TEM00 or a transverse order — and each hypothesis (which family is TEM00, the sweep
 * direction, the one-way Gouy phase anywhere in 0 … π) is scored by how well the predicted places of orders
 * N·ψ/π mod 1 (Siegman, "Lasers" (1986), ch. 19) explain every resonance. The geometry's ψ is a prior.
 * Readings come best first; empty when no resonance repeats (less than one FSR in view).
 */
export function readSpectrum(peaks: SpectrumPeak[], options: ReadSpectrumOptions): SpectrumReading[] {
  const { predictedGouyRad, sigmaV, maxOrder = 8, gouyPriorWidth = 0.1, keep = 4, sidebandOffsetFsr = null, directions = ['up', 'down'] } = options
  if (peaks.length < 2) return []
  const order = peaks.map((_, i) => i).sort((a, b) => peaks[a].tSeconds - peaks[b].tSeconds)
  const tallest = Math.max(...peaks.map((p) => p.heightV))
  const width = median(peaks.map((p) => p.widthSeconds))
  const endSeconds = options.endSeconds ?? Math.max(...peaks.map((p) => p.tSeconds))
  const startSeconds = options.startSeconds ?? Math.min(...peaks.map((p) => p.tSeconds))
  const periods = periodCandidates(peaks, order, sigmaV, width, endSeconds)
  const readings: SpectrumReading[] = []
  // The tallest comb's spacing is tried too, the comb kept as one family however its heights vary (a laser whose
  // power jumps between sweeps, or runs on several longitudinal modes, changes every height by a factor of a few);
  // the other families are linked as usual, by heights that look alike.
  const tried: { seconds: number; relative: number; comb?: boolean; ladder?: boolean }[] = periods.slice(0, 3).map((p) => ({ seconds: p.seconds, relative: 0.25 }))
  const comb = options.comb
  const combHeights = comb ? comb.members.map((i) => peaks[i].heightV) : []
  // Only when no period explains the repeats well by itself (heights that jump from one FSR to the next).
  // Three members at least: two may as well be one TEM00 and its order 1 (the pipeline's comb check says so).
  const combPeriod = comb && comb.members.length >= 3 && Math.max(...combHeights) <= 4 * Math.min(...combHeights) && !(periods[0]?.score >= 0.9)
    ? (peaks[comb.members[comb.members.length - 1]].tSeconds - peaks[comb.members[0]].tSeconds) / (comb.fsrIndex[comb.fsrIndex.length - 1] - comb.fsrIndex[0])
    : null
  if (combPeriod) tried.push({ seconds: combPeriod, relative: 0.25, comb: true })
  // When nothing repeats (a sweep of little more than one FSR that holds one TEM00 and a ladder of orders), the
  // spacing from the tallest resonance to each other one may be k·ψ/π of an FSR (ψ from the geometry, k = 1 … 4):
  // those periods are tried with a straight-line sweep. They lean on the geometry and pay for it (NO_REPEAT_COST).
  // Three resonances at least: two would leave the period free (the second may be any order, either way).
  if (!(periods[0]?.score >= 0.5) && peaks.filter((p) => p.heightV >= 5 * sigmaV).length >= 3) {
    const top = order.slice().sort((a, b) => peaks[b].heightV - peaks[a].heightV)
    const anchor = peaks[top[0]]
    for (const j of top.slice(1, 6)) {
      const spacing = Math.abs(peaks[j].tSeconds - anchor.tSeconds)
      for (let k = 1; k <= 4; k++) {
        const place = frac((k * predictedGouyRad) / Math.PI)
        for (const f of [place, 1 - place]) if (f > 0.05) tried.push({ seconds: spacing / f, relative: 0.25, ladder: true })
      }
    }
  }
  for (const period of tried) {
    const links = period.ladder ? [] : period.comb && comb ? combLinks(linkFamilies(peaks, order, period.seconds, sigmaV, width, period.relative), comb) : linkFamilies(peaks, order, period.seconds, sigmaV, width, period.relative)
    if (links.length === 0 && !period.ladder) continue
    const chains = chainsFrom(links, peaks.length)
    // On the tallest comb's period the comb itself calibrates (through up to four members exactly, as on TEM00).
    const calibration = period.ladder
      ? straightSweep(peaks, period.seconds)
      : period.comb && comb && comb.members.length >= 3
        ? calibrateSweep(comb.members.map((i) => peaks[i].tSeconds), comb.fsrIndex)
        : calibrateFromChains(peaks, chains, period.seconds)
    if (!calibration) continue
    const nu = peaks.map((p) => frequencyAt(calibration, p.tSeconds))
    const linewidthFsr = Math.max(width / period.seconds, 1e-5)
    const families = familiesFrom(peaks, nu, chains, Math.max(linewidthFsr, calibration.residualRmsFsr), 0.25, sigmaV)
    markOrphans(families, nu, calibration, startSeconds, endSeconds, sigmaV)
    const satelliteOffsetFsr = markSatellites(families, predictedGouyRad, linewidthFsr, sigmaV)
    // A sweep calibrated poorly (TEM00 off its whole numbers by more than 0.5 % of an FSR) places the orders too
    // loosely to overrule the geometry: the Gouy phase is then held near the prediction.
    const priorWidth = calibration.residualRmsFsr > 0.005 ? Math.min(gouyPriorWidth, 0.015) : gouyPriorWidth
    const settings = { predicted: predictedGouyRad, priorWidth, maxOrder, linewidthFsr, tallest, sigmaV, sidebandOffsetFsr, directions }
    const hyps = hypotheses(families, settings)
    for (const h of hyps) {
      const reading = finish(h, families, peaks, nu, calibration, period.seconds, links.length)
      if (period.ladder) reading.cost += NO_REPEAT_COST
      reading.satelliteOffsetFsr = satelliteOffsetFsr === null ? null : h.direction * satelliteOffsetFsr
      reading.cost += missingLineCost(families, h, nu, calibration, { startSeconds, endSeconds, tallest, sigmaV, linewidthFsr, marginFsr: period.ladder ? 0.15 : 0.02 })
      readings.push(reading)
    }
  }
  readings.sort((a, b) => a.cost - b.cost)
  const distinct: SpectrumReading[] = []
  for (const r of readings) {
    const same = distinct.some((d) => d.direction === r.direction && Math.abs(d.gouyRad - r.gouyRad) < 0.01 * d.gouyRad && d.fundamentals.join() === r.fundamentals.join())
    if (!same) distinct.push(r)
    if (distinct.length >= keep) break
  }
  return distinct
}

/** The links found, less any that touch the comb, plus the comb's own members linked in order. */
function combLinks(found: Link[], comb: { members: number[]; fsrIndex: number[] }): Link[] {
  const members = new Set(comb.members)
  const own: Link[] = []
  for (let k = 1; k < comb.members.length; k++) {
    if (comb.fsrIndex[k] - comb.fsrIndex[k - 1] === 1) own.push({ from: comb.members[k - 1], to: comb.members[k], weight: 1 })
  }
  return [...found.filter((l) => !members.has(l.from) && !members.has(l.to)), ...own]
}

/** Price of a reading whose FSR comes from the geometry's Gouy phase because no resonance repeats in the sweep. */
const NO_REPEAT_COST = 0.05

function finish(h: Hypothesis, families: Family[], peaks: SpectrumPeak[], nu: number[], calibration: SweepCalibration, periodSeconds: number, links: number): SpectrumReading {
  const base = families[h.fundamental]
  const origin = base.phase
  // One TEM00 per FSR: of two members in one period (a twin or a fragment), the taller.
  const byIndex = new Map<number, number>()
  for (const i of base.members) {
    const k = Math.round(nu[i] - origin)
    const other = byIndex.get(k)
    if (other === undefined || peaks[i].heightV > peaks[other].heightV) byIndex.set(k, i)
  }
  const fundamentals = [...byIndex.values()].sort((a, b) => peaks[a].tSeconds - peaks[b].tSeconds)
  const index = fundamentals.map((i) => Math.round(nu[i] - origin))
  const fsrIndex = index.map((k) => k - index[0])
  // TEM00 at whole numbers, the first at 0 (as a calibration on the TEM00 comb has them).
  const shifted: SweepCalibration = { ...calibration, coefficients: [calibration.coefficients[0] - origin - index[0], ...calibration.coefficients.slice(1)], ...spacingOf(fundamentals.map((i) => peaks[i].tSeconds), fsrIndex, calibration) }
  const orders: (number | null)[] = peaks.map(() => null)
  families.forEach((f, k) => f.members.forEach((i) => (orders[i] = f.satelliteOf >= 0 ? h.orders[f.satelliteOf] : h.orders[k])))
  const heights = new Map<number, number>()
  families.forEach((f, k) => {
    const o = h.orders[k]
    if (o !== null && o >= 0) heights.set(o, Math.max(heights.get(o) ?? 0, f.heightV))
  })
  const total = [...heights.values()].reduce((a, b) => a + b, 0)
  return {
    calibration: shifted,
    direction: h.direction === 1 ? 'up' : 'down',
    gouyRad: h.gouyRad,
    fundamentals,
    fsrIndex,
    orders,
    cost: h.cost,
    roughFraction: total > 0 ? (heights.get(0) ?? 0) / total : 0,
    periodSeconds,
    calibratingLinks: links,
    satelliteOffsetFsr: null,
  }
}

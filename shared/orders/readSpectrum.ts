import { calibrateSweep, type SweepCalibration } from '../calibration/calibrateSweep'

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
  // The tallest comb's spacing is tried too, its families linked however their heights vary (a laser whose power
  // jumps between sweeps, or runs on several longitudinal modes, changes every height by a factor of a few).
  const tried: { seconds: number; relative: number; comb?: boolean; ladder?: boolean }[] = periods.slice(0, 3).map((p) => ({ seconds: p.seconds, relative: 0.25 }))
  const comb = options.comb
  const combHeights = comb ? comb.members.map((i) => peaks[i].heightV) : []
  // Only when no period explains the repeats well by itself (heights that jump from one FSR to the next).
  const combPeriod = comb && comb.members.length >= 2 && Math.max(...combHeights) <= 4 * Math.min(...combHeights) && !(periods[0]?.score >= 0.9)
    ? (peaks[comb.members[comb.members.length - 1]].tSeconds - peaks[comb.members[0]].tSeconds) / (comb.fsrIndex[comb.fsrIndex.length - 1] - comb.fsrIndex[0])
    : null
  if (combPeriod) tried.push({ seconds: combPeriod, relative: 0.7, comb: true })
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
    const links = period.ladder ? [] : linkFamilies(peaks, order, period.seconds, sigmaV, width, period.relative)
    if (links.length === 0 && !period.ladder) continue
    const chains = chainsFrom(links, peaks.length)
    // On the tallest comb's period the comb itself calibrates (through up to four members exactly, as on TEM00).
    const calibration = period.ladder
      ? straightSweep(peaks, period.seconds)
      : period.comb && comb && comb.members.length >= 3
        ? calibrateSweep(comb.members.map((i) => peaks[i].tSeconds), comb.fsrIndex)
        : calibrateFromChains(peaks, chains, period.seconds)
    if (!calibration) continue
    const nu = peaks.map((p) => polyval(calibration.coefficients, (p.tSeconds - calibration.t0Seconds) / calibration.scaleSeconds))
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
      reading.cost += missingLineCost(reading, families, h, nu, calibration, { startSeconds, endSeconds, tallest, sigmaV, linewidthFsr, marginFsr: period.ladder ? 0.15 : 0.02 })
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

/** Price of a reading whose FSR comes from the geometry's Gouy phase because no resonance repeats in the sweep. */
const NO_REPEAT_COST = 0.05

/** ν = (t − t_mid)/period: a straight-line sweep (no resonance repeats to show its bend). */
function straightSweep(peaks: SpectrumPeak[], period: number): SweepCalibration {
  const lo = Math.min(...peaks.map((p) => p.tSeconds))
  const hi = Math.max(...peaks.map((p) => p.tSeconds))
  const scaleSeconds = Math.max((hi - lo) / 2, period / 2)
  return {
    coefficients: [0, scaleSeconds / period],
    t0Seconds: (lo + hi) / 2,
    scaleSeconds,
    polynomialOrder: 1,
    residualRmsFsr: 0,
    fsrSeconds: period,
    meanSpacingSeconds: period,
    spacingRangeSeconds: [period, period],
  }
}

/** Two resonances look alike when their heights differ by less than a quarter of the taller plus 4σ (drift, noise). */
function alike(a: number, b: number, sigmaV: number, relative = 0.25): boolean {
  return Math.abs(a - b) <= relative * Math.max(a, b) + 4 * sigmaV
}

/**
 * Candidate periods: spacings between resonances that look alike, grouped within 3 %, each scored by the share of
 * resonance height that finds its like one period later (linkFamilies follows the local period of a nonlinear
 * sweep). A multiple of the period scores as well as the period itself (every family repeats at 2P too): the
 * shortest period within 15 % of the best score comes first.
 */
export function periodCandidates(peaks: SpectrumPeak[], order: number[], sigmaV: number, width: number, endSeconds: number): { seconds: number; score: number }[] {
  const strong = order.filter((i) => peaks[i].heightV >= 6 * sigmaV)
  const top = strong.slice().sort((a, b) => peaks[b].heightV - peaks[a].heightV).slice(0, 30)
  const spacings: number[] = []
  for (let x = 0; x < top.length; x++) {
    for (let y = 0; y < top.length; y++) {
      const a = peaks[top[x]]
      const b = peaks[top[y]]
      const d = b.tSeconds - a.tSeconds
      if (d > 20 * width && alike(a.heightV, b.heightV, sigmaV)) spacings.push(d)
    }
  }
  spacings.sort((a, b) => a - b)
  const groups: number[][] = []
  for (const d of spacings) {
    const last = groups[groups.length - 1]
    if (last && d <= last[0] * 1.03) last.push(d)
    else groups.push([d])
  }
  const scored = groups.slice(0, 40).map((g) => {
    const seconds = median(g)
    const links = linkFamilies(peaks, strong, seconds, sigmaV, width)
    return { seconds, score: periodicity(peaks, strong, links, endSeconds) }
  })
  const best = Math.max(0, ...scored.map((c) => c.score))
  scored.sort((a, b) => {
    const goodA = a.score >= 0.85 * best
    const goodB = b.score >= 0.85 * best
    if (goodA !== goodB) return goodA ? -1 : 1
    return goodA ? a.seconds - b.seconds : b.score - a.score
  })
  return scored
}

/** Share of the height of resonances with room for a repeat (by the links' local period) that are linked to one. */
function periodicity(peaks: SpectrumPeak[], strong: number[], links: Link[], endSeconds: number): number {
  if (links.length === 0) return 0
  const spacing = median(links.map((l) => peaks[l.to].tSeconds - peaks[l.from].tSeconds))
  const linked = new Map(links.map((l) => [l.from, l.weight]))
  let matched = 0
  let eligible = 0
  for (const i of strong) {
    const p = peaks[i]
    const room = p.tSeconds + 0.97 * spacing <= endSeconds
    if (!room && !linked.has(i)) continue
    eligible += p.heightV
    matched += linked.get(i) ?? 0
  }
  return eligible > 0 ? (matched / eligible) * Math.min(1, links.length / 2) : 0
}

interface Link {
  from: number
  to: number
  weight: number
}

/**
 * Links each resonance to its like one period later. The local period is followed: a first pass within 15 % of the
 * period gives the period's slow change along the sweep (a straight line in time, weighted by height), and the
 * second pass links within 4 % of that local period (or three linewidths).
 */
function linkFamilies(peaks: SpectrumPeak[], order: number[], period: number, sigmaV: number, width: number, relative = 0.25): Link[] {
  let local = (_t: number) => period
  let links: Link[] = []
  for (const tolerance of [0.15, 0.06, 0.04]) {
    links = []
    const taken = new Set<number>()
    const candidates: Link[] = []
    for (const i of order) {
      const p = peaks[i]
      const expected = local(p.tSeconds)
      let best: Link | null = null
      let bestCost = Infinity
      for (const j of order) {
        const q = peaks[j]
        const d = q.tSeconds - p.tSeconds - expected
        if (Math.abs(d) > Math.max(tolerance * expected, 3 * width) || !alike(p.heightV, q.heightV, sigmaV, relative)) continue
        const cost = Math.abs(d) / expected + Math.abs(p.heightV - q.heightV) / Math.max(p.heightV, q.heightV)
        if (cost < bestCost) {
          bestCost = cost
          best = { from: i, to: j, weight: Math.min(p.heightV, q.heightV) }
        }
      }
      if (best) candidates.push(best)
    }
    // Each resonance has at most one predecessor: the tallest link into it wins.
    candidates.sort((a, b) => b.weight - a.weight)
    for (const l of candidates) {
      if (taken.has(l.to)) continue
      taken.add(l.to)
      links.push(l)
    }
    if (links.length === 0) return []
    // Local period: weighted straight line through the links' spacings against their mid times.
    let sw = 0
    let st = 0
    let sd = 0
    let stt = 0
    let std = 0
    for (const l of links) {
      const t = (peaks[l.from].tSeconds + peaks[l.to].tSeconds) / 2
      const d = peaks[l.to].tSeconds - peaks[l.from].tSeconds
      sw += l.weight
      st += l.weight * t
      sd += l.weight * d
      stt += l.weight * t * t
      std += l.weight * t * d
    }
    const tm = st / sw
    const dm = sd / sw
    const varT = stt / sw - tm * tm
    const slope = varT > 0 && links.length >= 3 ? (std / sw - tm * dm) / varT : 0
    local = (t: number) => Math.max(0.5 * dm, dm + slope * (t + dm / 2 - tm))
  }
  return links
}

/** Chains of linked resonances (one family, one member per FSR): each a list of peak indices in time order. */
function chainsFrom(links: Link[], count: number): number[][] {
  const next = new Map<number, number>()
  const hasPrevious = new Set<number>()
  for (const l of links) {
    next.set(l.from, l.to)
    hasPrevious.add(l.to)
  }
  const chains: number[][] = []
  for (let i = 0; i < count; i++) {
    if (hasPrevious.has(i) || !next.has(i)) continue
    const chain = [i]
    let k = i
    while (next.has(k)) {
      k = next.get(k)!
      chain.push(k)
    }
    chains.push(chain)
  }
  return chains
}

/**
 * ν(t) = Σ cₘ uᵐ (m ≥ 1) with one free offset per chain, each chain's members one FSR apart: weighted linear least
 * squares (Press et al., "Numerical Recipes", §15.4) with the offsets eliminated by centring each chain. The degree
 * grows with the links, up to cubic (a piezo's response is close to cubic; common practice): resonance centres are
 * far more precise than a linewidth, so a polynomial through them may interpolate.
 */
function calibrateFromChains(peaks: SpectrumPeak[], chains: number[][], period: number): SweepCalibration | null {
  const times = chains.flat().map((i) => peaks[i].tSeconds)
  if (times.length < 2) return null
  const lo = Math.min(...peaks.map((p) => p.tSeconds))
  const hi = Math.max(...peaks.map((p) => p.tSeconds))
  const t0Seconds = (lo + hi) / 2
  const scaleSeconds = Math.max((hi - lo) / 2, period / 2)
  const linkCount = chains.reduce((s, c) => s + c.length - 1, 0)
  const degree = Math.min(3, linkCount)
  const rows: { x: number[]; y: number; w: number }[] = []
  for (const chain of chains) {
    const u = chain.map((i) => (peaks[i].tSeconds - t0Seconds) / scaleSeconds)
    const w = chain.map((i) => peaks[i].heightV)
    const wSum = w.reduce((a, b) => a + b, 0)
    const meanK = chain.reduce((s, _, k) => s + w[k] * k, 0) / wSum
    const meanPow = Array.from({ length: degree }, (_, m) => chain.reduce((s, _, k) => s + w[k] * u[k] ** (m + 1), 0) / wSum)
    chain.forEach((_, k) => rows.push({ x: meanPow.map((mp, m) => u[k] ** (m + 1) - mp), y: k - meanK, w: w[k] }))
  }
  const c = weightedLeastSquares(rows, degree)
  if (!c || !(c[0] > 0)) return null
  const coefficients = [0, ...c]
  const rate = (t: number) => {
    const u = (t - t0Seconds) / scaleSeconds
    let d = 0
    for (let m = coefficients.length - 1; m >= 1; m--) d = d * u + m * coefficients[m]
    return d / scaleSeconds
  }
  if (!(rate(lo) > 0 && rate(hi) > 0)) return null
  const spacings = chains.flatMap((ch) => ch.slice(1).map((j, k) => peaks[j].tSeconds - peaks[ch[k]].tSeconds)).sort((a, b) => a - b)
  let ss = 0
  let n = 0
  for (const chain of chains) {
    const nu = chain.map((i) => polyval(coefficients, (peaks[i].tSeconds - t0Seconds) / scaleSeconds))
    const offset = nu.reduce((s, v, k) => s + v - k, 0) / nu.length
    nu.forEach((v, k) => {
      ss += (v - k - offset) ** 2
      n++
    })
  }
  return {
    coefficients,
    t0Seconds,
    scaleSeconds,
    polynomialOrder: degree,
    residualRmsFsr: Math.sqrt(ss / Math.max(n, 1)),
    fsrSeconds: median(spacings),
    meanSpacingSeconds: spacings.reduce((a, b) => a + b, 0) / spacings.length,
    spacingRangeSeconds: [spacings[0], spacings[spacings.length - 1]],
  }
}

/** A family: resonances at one place mod 1 FSR (one transverse order, or a sideband), with its typical height. */
interface Family {
  phase: number
  heightV: number
  members: number[]
  /**
   * A tall family that does not repeat where the sweep has room for it: no mode of the cavity (a mode resonates once
   * every FSR) but a resonance seen past a turn of a ramp-less sweep, or a glitch. It takes no part in any reading.
   */
  orphan: boolean
  /** Index of the family this one is a satellite of (see markSatellites), or −1. */
  satelliteOf: number
}

/** Groups resonances by their place mod 1 FSR: chains first (they are families by construction), then by nearness. */
function familiesFrom(peaks: SpectrumPeak[], nu: number[], chains: number[][], linewidthFsr: number, relative: number, sigmaV: number): Family[] {
  const tolerance = Math.max(0.012, 3 * linewidthFsr)
  const groups: number[][] = chains.map((c) => c.slice())
  const inChain = new Set(chains.flat())
  peaks.forEach((_, i) => {
    if (!inChain.has(i)) groups.push([i])
  })
  const families = groups.map((g) => ({ phase: circularMean(g.map((i) => nu[i]), g.map((i) => peaks[i].heightV)), heightV: median(g.map((i) => peaks[i].heightV)), members: g, orphan: false, satelliteOf: -1 }))
  families.sort((a, b) => b.heightV - a.heightV)
  const merged: Family[] = []
  for (const f of families) {
    const home = merged.find((m) => circularDistance(m.phase, f.phase) <= tolerance && alike(m.heightV, f.heightV, sigmaV, relative))
    if (home) home.members.push(...f.members)
    else merged.push({ ...f, members: f.members.slice() })
  }
  return merged
}

function markOrphans(families: Family[], nu: number[], calibration: SweepCalibration, startSeconds: number, endSeconds: number, sigmaV: number): void {
  const at = (t: number) => polyval(calibration.coefficients, (t - calibration.t0Seconds) / calibration.scaleSeconds)
  const lo = Math.max(at(startSeconds) + 0.03, Math.min(...nu) - 0.5)
  const hi = Math.min(at(endSeconds) - 0.03, Math.max(...nu) + 0.5)
  const weakest = Math.min(...families.map((f) => f.heightV))
  for (const f of families) {
    if (f.heightV < Math.max(15 * sigmaV, 3 * weakest)) continue
    let room = 0
    for (let k = Math.ceil(lo - f.phase); k + f.phase <= hi; k++) room++
    // A mode family may miss a place at the ends of the calibrated stretch; an orphan misses most of them.
    const seen = new Set(f.members.map((i) => Math.round(nu[i] - f.phase)))
    if (room >= 2 * seen.size) f.orphan = true
  }
}

/**
 * A laser running on two longitudinal modes shows every cavity resonance twice, a fixed frequency apart and with a
 * fixed height ratio (common practice: a helium-neon laser often does). When three or more families each have a
 * partner at the same offset δ (not a Gouy-phase step) with the same height ratio (within 30 %), the smaller of
 * each pair is a satellite: explained by its partner's order, measured by nobody (the ratio is the same for every
 * order, so leaving satellites out does not move the shares). Returns δ, or null.
 */
function markSatellites(families: Family[], predictedGouy: number, linewidthFsr: number, sigmaV: number): number | null {
  const tolerance = Math.max(0.01, 3 * linewidthFsr)
  const strong = families.filter((f) => !f.orphan && f.heightV >= 10 * sigmaV).slice(0, 8)
  let best: { offset: number; pairs: [Family, Family][]; weight: number } | null = null
  for (const a of strong) {
    for (const b of strong) {
      if (a === b || b.heightV > a.heightV) continue
      const offset = signedCircular(b.phase - a.phase)
      if (Math.abs(offset) < 2 * tolerance) continue
      // A step of the Gouy phase (order N to N + k) also repeats across families: not a satellite.
      const gouyStep = [1, 2, 3, 4].some((k) => Math.abs(signedCircular(Math.abs(offset) - (k * predictedGouy) / Math.PI)) < 0.05 || Math.abs(signedCircular(Math.abs(offset) + (k * predictedGouy) / Math.PI)) < 0.05)
      if (gouyStep) continue
      const pairs: [Family, Family][] = []
      for (const c of strong) {
        const d = strong.find((e) => e !== c && e.heightV <= c.heightV && Math.abs(signedCircular(e.phase - c.phase - offset)) <= tolerance)
        if (d) pairs.push([c, d])
      }
      if (pairs.length < 3) continue
      const ratios = pairs.map(([c, d]) => d.heightV / c.heightV)
      const meanRatio = ratios.reduce((x, y) => x + y, 0) / ratios.length
      if (ratios.some((r) => Math.abs(r / meanRatio - 1) > 0.3)) continue
      const weight = pairs.reduce((sum, [, d]) => sum + d.heightV, 0)
      if (!best || weight > best.weight) best = { offset, pairs, weight }
    }
  }
  if (!best) return null
  for (const [c, d] of best.pairs) d.satelliteOf = families.indexOf(c)
  return best.offset
}

interface Hypothesis {
  fundamental: number
  direction: 1 | -1
  gouyRad: number
  cost: number
  orders: (number | null)[]
}

/**
 * Every (TEM00 family, direction, ψ) worth scoring: ψ from each family placed as order 1 … 4 of each candidate TEM00
 * (ψ = π (±Δφ + m)/N), and the prediction itself. Cost: the height of families no order explains (twice, in units of
 * the tallest), a small price per order step used (higher orders can explain anything), and the Gouy prior.
 */
interface HypothesisSettings {
  predicted: number
  priorWidth: number
  maxOrder: number
  linewidthFsr: number
  tallest: number
  sigmaV: number
  sidebandOffsetFsr: number | null
  directions: ('up' | 'down')[]
}

/**
 * Largest share of the power a Gaussian input beam puts into order N (index N ≥ 1), with a margin: over 200,000
 * random offsets, tilts and waist errors the Hermite–Gauss decomposition of shared/sim/beamOrderPowers gave at most
 * 0.44, 0.34, 0.30, 0.27 and 0.26 for orders 1–5 (computed here, not a published figure).
 */
const MAX_ORDER_SHARE = [1, 0.5, 0.4, 0.36, 0.33, 0.32]

/** Weight of the plausibility prior (see plausibilityCost), in units of the tallest family's height. */
const PLAUSIBILITY_WEIGHT = 0.1

function hypotheses(families: Family[], s: HypothesisSettings): Hypothesis[] {
  const { predicted, priorWidth, maxOrder, linewidthFsr, tallest, sigmaV } = s
  const tolerance = Math.max(0.01, 3 * linewidthFsr)
  const visible = families.filter((f) => f.heightV >= 5 * sigmaV && !f.orphan && f.satelliteOf < 0).slice(0, 12)
  const candidates = visible.filter((f) => f.heightV >= 0.03 * tallest).slice(0, 8)
  const out: Hypothesis[] = []
  for (const base of candidates) {
    const b = families.indexOf(base)
    for (const direction of s.directions.map((d) => (d === 'up' ? 1 : -1) as 1 | -1)) {
      const psis = new Set<number>([predicted])
      for (const f of visible) {
        if (f === base) continue
        const d = direction * (f.phase - base.phase)
        for (let n = 1; n <= 4; n++) {
          for (let m = 0; m < n; m++) {
            const psi = (Math.PI * (frac(d) + m)) / n
            if (psi > 0.02 && psi < Math.PI - 0.02) psis.add(psi)
          }
        }
      }
      for (const psi0 of psis) {
        let psi = psi0
        let scored = scoreHypothesis(families, b, direction, psi, maxOrder, tolerance, s.sidebandOffsetFsr)
        // Refine ψ by weighted least squares on the families explained (δψ/π = Σ w N r / Σ w N²).
        for (let round = 0; round < 2; round++) {
          const refined = psi + Math.PI * scored.shift
          if (!(refined > 0 && refined < Math.PI)) break
          psi = refined
          scored = scoreHypothesis(families, b, direction, psi, maxOrder, tolerance, s.sidebandOffsetFsr)
        }
        const prior = ((psi / predicted - 1) / priorWidth) ** 2
        const cost = scored.cost / tallest + 0.02 * prior + PLAUSIBILITY_WEIGHT * plausibilityCost(families, scored.orders, tallest)
        out.push({ fundamental: b, direction, gouyRad: psi, cost, orders: scored.orders })
      }
    }
  }
  out.sort((a, b) => a.cost - b.cost)
  return out.slice(0, 12)
}

/**
 * How unlikely the order powers of a reading are for a real beam: the summed rise of the family heights from each
 * order to the next (in units of the tallest). Misalignment spreads power over orders like a Poisson distribution
 * and mismatch puts less in each higher even order (Anderson, Appl. Opt. 23, 2944 (1984); from memory), so a reading
 * whose power climbs towards its highest order — the mirror image of a real spectrum — pays for it.
 */
function plausibilityCost(families: Family[], orders: (number | null)[], tallest: number): number {
  const height: number[] = []
  orders.forEach((o, k) => {
    if (o !== null && o >= 0) height[o] = Math.max(height[o] ?? 0, families[k].heightV)
  })
  let rise = 0
  for (let n = 1; n < height.length; n++) rise += Math.max(0, (height[n] ?? 0) - (height[n - 1] ?? 0))
  // A Gaussian beam cannot put most of its power into one higher order: what a reading's shares exceed the bound by
  // counts in full (heights stand for powers: every order's line has the same area per FSR).
  const total = height.reduce((sum, h) => sum + (h ?? 0), 0)
  let excess = 0
  for (let n = 1; n < height.length; n++) excess += Math.max(0, (height[n] ?? 0) / total - (MAX_ORDER_SHARE[n] ?? MAX_ORDER_SHARE[MAX_ORDER_SHARE.length - 1]))
  // One order is one mode, resonating once per FSR with one height (drift aside): several families read as the same
  // order must have about the same height. What a second family lacks beyond a factor 1.5 counts, five times over.
  let scatter = 0
  orders.forEach((o, k) => {
    if (o !== null && o >= 0 && families[k].heightV < height[o] / 1.5) scatter += height[o] / 1.5 - families[k].heightV
  })
  return (rise + 5 * scatter) / tallest + excess / PLAUSIBILITY_WEIGHT
}

function scoreHypothesis(families: Family[], base: number, direction: 1 | -1, psi: number, maxOrder: number, tolerance: number, sidebandOffsetFsr: number | null): { cost: number; orders: (number | null)[]; shift: number } {
  const orders: (number | null)[] = families.map(() => null)
  orders[base] = 0
  let cost = 0
  let num = 0
  let den = 0
  const origin = families[base].phase
  families.forEach((f, k) => {
    if (k === base) return
    if (f.orphan) {
      // The same for every reading of this period; it weighs periods against each other.
      cost += f.heightV
      return
    }
    if (f.satelliteOf >= 0) return
    const d = direction * (f.phase - origin)
    let best: number | null = null
    let residual = 0
    for (let n = 1; n <= maxOrder; n++) {
      const r = signedCircular(d - (n * psi) / Math.PI)
      if (Math.abs(r) <= tolerance) {
        best = n
        residual = r
        break
      }
    }
    orders[k] = best
    if (best === null && sidebandOffsetFsr !== null && isSideband(d, psi, maxOrder, tolerance, sidebandOffsetFsr) && hasTallerCarrier(families, f, sidebandOffsetFsr, tolerance)) {
      // A modulation sideband of a low order: explained, but no order of its own (−1 marks it).
      orders[k] = -1
    } else if (best === null) {
      cost += 2 * f.heightV
    } else {
      cost += f.heightV * (0.01 * best + (residual / tolerance) ** 2 * 0.05)
      num += f.heightV * best * residual
      den += f.heightV * best * best
    }
  })
  return { cost, orders, shift: den > 0 ? num / den : 0 }
}

/**
 * Every order a reading uses must show at each of its predicted places inside the sweep (an order resonates once
 * per FSR): each place without a resonance costs the order's height, in units of the tallest. A wrong period or a
 * TEM00 ladder read as a comb predicts lines where there are none.
 */
function missingLineCost(
  reading: SpectrumReading,
  families: Family[],
  h: Hypothesis,
  nu: number[],
  calibration: SweepCalibration,
  span: { startSeconds: number; endSeconds: number; tallest: number; sigmaV: number; linewidthFsr: number; marginFsr: number },
): number {
  const origin = families[h.fundamental].phase
  const at = (t: number) => polyval(calibration.coefficients, (t - calibration.t0Seconds) / calibration.scaleSeconds) - origin
  const margin = span.marginFsr
  const placed = nu.map((v) => v - origin).sort((a, b) => a - b)
  // Only where the sweep is calibrated (between the resonances seen, half an FSR beyond): past that it is extrapolated.
  const lo = Math.max(at(span.startSeconds) + margin, placed[0] - 0.5)
  const hi = Math.min(at(span.endSeconds) - margin, placed[placed.length - 1] + 0.5)
  const tolerance = Math.max(0.015, 4 * span.linewidthFsr, 3 * calibration.residualRmsFsr)
  const heights = new Map<number, number>()
  h.orders.forEach((o, k) => {
    if (o !== null && o >= 0) heights.set(o, Math.max(heights.get(o) ?? 0, families[k].heightV))
  })
  // Lines near the detection limit may be missed by the search: only families well above it must show every time,
  // and an order's missing lines never cost more than leaving its family unexplained would.
  const weakest = Math.min(...families.map((f) => f.heightV))
  let cost = 0
  for (const [order, height] of heights) {
    if (height < Math.max(15 * span.sigmaV, 3 * weakest)) continue
    const offset = (h.direction * order * h.gouyRad) / Math.PI
    let missing = 0
    for (let k = Math.ceil(lo - offset); k + offset <= hi; k++) {
      const x = k + offset
      if (!placed.some((v) => Math.abs(v - x) <= tolerance)) missing += height / span.tallest
    }
    cost += Math.min(missing, (1.5 * height) / span.tallest)
  }
  void reading
  return cost
}

/** A sideband is weaker than its carrier, which sits one modulation frequency away (Black, Am. J. Phys. 69, 79 (2001)). */
function hasTallerCarrier(families: Family[], f: Family, offset: number, tolerance: number): boolean {
  return families.some((g) => g !== f && g.heightV > f.heightV && [1, -1].some((sign) => Math.abs(signedCircular(g.phase - f.phase - sign * offset)) <= tolerance))
}

function isSideband(d: number, psi: number, maxOrder: number, tolerance: number, offset: number): boolean {
  for (let n = 0; n <= Math.min(maxOrder, 2); n++) {
    for (const sign of [1, -1]) if (Math.abs(signedCircular(d - (n * psi) / Math.PI - sign * offset)) <= tolerance) return true
  }
  return false
}

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

/**
 * The FSR on the time axis as the TEM00 resonances give it (median, mean and range of their spacings, as on a TEM00
 * comb); with a single TEM00, the local period of the calibration at it.
 */
function spacingOf(times: number[], fsrIndex: number[], calibration: SweepCalibration): Pick<SweepCalibration, 'fsrSeconds' | 'meanSpacingSeconds' | 'spacingRangeSeconds'> {
  if (times.length >= 2) {
    const spacings = times.slice(1).map((t, k) => (t - times[k]) / (fsrIndex[k + 1] - fsrIndex[k])).sort((a, b) => a - b)
    return {
      fsrSeconds: median(spacings),
      meanSpacingSeconds: (times[times.length - 1] - times[0]) / (fsrIndex[fsrIndex.length - 1] - fsrIndex[0]),
      spacingRangeSeconds: [spacings[0], spacings[spacings.length - 1]],
    }
  }
  const u = (times[0] - calibration.t0Seconds) / calibration.scaleSeconds
  const c = calibration.coefficients
  let d = 0
  for (let m = c.length - 1; m >= 1; m--) d = d * u + m * c[m]
  const local = calibration.scaleSeconds / d
  return { fsrSeconds: local, meanSpacingSeconds: local, spacingRangeSeconds: [local, local] }
}

function weightedLeastSquares(rows: { x: number[]; y: number; w: number }[], size: number): number[] | null {
  const a = Array.from({ length: size }, () => new Array<number>(size + 1).fill(0))
  for (const r of rows) {
    for (let i = 0; i < size; i++) {
      for (let j = 0; j < size; j++) a[i][j] += r.w * r.x[i] * r.x[j]
      a[i][size] += r.w * r.x[i] * r.y
    }
  }
  // A faint ridge on the curvature terms keeps a short chain from bending the sweep wildly.
  for (let i = 1; i < size; i++) a[i][i] += 1e-6 * a[0][0]
  for (let col = 0; col < size; col++) {
    let pivot = col
    for (let r = col + 1; r < size; r++) if (Math.abs(a[r][col]) > Math.abs(a[pivot][col])) pivot = r
    ;[a[col], a[pivot]] = [a[pivot], a[col]]
    if (!(Math.abs(a[col][col]) > 0)) return null
    for (let r = 0; r < size; r++) {
      if (r === col) continue
      const f = a[r][col] / a[col][col]
      for (let c = col; c <= size; c++) a[r][c] -= f * a[col][c]
    }
  }
  return a.map((row, r) => row[size] / row[r])
}

function polyval(c: number[], u: number): number {
  let v = 0
  for (let k = c.length - 1; k >= 0; k--) v = v * u + c[k]
  return v
}

function circularMean(values: number[], weights: number[]): number {
  let s = 0
  let c = 0
  values.forEach((v, k) => {
    s += weights[k] * Math.sin(2 * Math.PI * v)
    c += weights[k] * Math.cos(2 * Math.PI * v)
  })
  return frac(Math.atan2(s, c) / (2 * Math.PI))
}

function circularDistance(a: number, b: number): number {
  return Math.abs(signedCircular(a - b))
}

function signedCircular(d: number): number {
  return d - Math.round(d)
}

function frac(x: number): number {
  return x - Math.floor(x)
}

function median(values: number[]): number {
  if (values.length === 0) return NaN
  const s = values.slice().sort((a, b) => a - b)
  const m = s.length >> 1
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2
}

import type { OrderEstimate } from '../analysis/types'
import type { SweepCalibration } from '../calibration/calibrateSweep'
import { EngineError } from '../errors'
import { goldenSectionMinimum } from '../fit/goldenSectionMinimum'
import { parabolicMinimum } from '../fit/parabolicMinimum'
import { COARSE_DIGITISER_SIGMA, fitAboveFloor } from './fitAboveFloor'
import { fitOrderPowers, type PredictedLine } from './fitOrderPowers'
import { lineProblem, orderHeightSums, SUPPORT_LINEWIDTHS } from './lineProblem'
import { searchSplit, splitLines, transverseMisfit } from './searchSplit'

/** An order is reported when its summed height stands this many standard errors above zero (3σ: a chance excess in an empty order is 0.13 %, common practice). */
const REPORT_SIGNIFICANCE = 3

export interface ShareInputs {
  /** The selected part as recorded, and its dark level: the line model fits its own slow background. */
  raw: Float64Array
  darkLevelV: number
  /** Carriers found and labelled, at their measured places (FSR units on the calibrated axis). */
  detected: { nu: number; order: number; heightV: number }[]
  /** A predicted line moves to a detected carrier of its order within this distance, FSR units. */
  placementToleranceFsr: number
  signal: Float64Array
  sigmaV: number
  calibration: SweepCalibration
  direction: 'up' | 'down'
  gouy: number
  finesse: number
  sidebands: { offsetFsr: number; ratio: number } | null
  orders: number[]
  firstIndex: number
  lastIndex: number
  /** TEM00 linewidth in samples. */
  samplesPerLinewidth: number
  /** Time of the part's first sample and the sample interval, seconds. */
  startSeconds: number
  dtSeconds: number
  preferHeight: boolean
  /** The digitiser step found in the record, volts (0 or absent when none). */
  quantumV?: number
  /** Look for orders split by astigmatism (see splitLines): the sample windows widen by this much, FSR. @default 0 (no search) */
  splitReachFsr?: number
}

export interface Shares {
  orders: Record<string, number>
  fundamentalFraction: number
  fundamentalFractionError: number | null
  measure: 'height' | 'area'
  reducedChiSquare: number | null
  shareOfPeak: (order: number, positionFsr: number) => number
  /** Finesse refined with the line model (null when the shares do not come from it). */
  finesse: number | null
  /** Summed share of the orders measured but not standing out of the noise (0 when shares come from peaks found). */
  belowNoiseShare: number
  /** Every order measured by the line model, reported or not (empty when shares come from the peaks found). */
  orderEstimates: OrderEstimate[]
  /** Astigmatic split between neighbouring lines of an order, FSR (0 when none is seen or none was looked for). */
  splitFsr: number
}

/** χ² per degree of freedom above which the line model is not trusted for heights. */
export const MAX_LINE_CHI_SQUARE = 3
/** … and above which it is not trusted at all (the resonances found are measured one by one instead). */
export const MAX_MODEL_CHI_SQUARE = 30

export function measureOrderShares(input: ShareInputs): Shares {
  const { finesse } = input
  // Without a sign of split orders the windows need no room for them (see the split search below).
  const narrow = lineProblem({ ...input, splitReachFsr: 0 })
  let { all, coarse } = narrow
  let lines = narrow.lines
  let reachFsr = 0
  // The shared linewidth is refined with the heights: every line of every order, their sidebands and the wings
  // of their neighbours share one Airy width on the calibrated axis, so the finesse comes from all of them and
  // not from TEM00 fits that see the neighbours' wings as baseline. The samples stay the same at every trial
  // (support fixed in FSR), so the residuals compare.
  // Sideband power is refined too, in turn with the width (coordinate descent): sidebands closer than a few
  // linewidths blur into the carrier and trade off with the width; farther ones lie outside the TEM00 fits.
  // The search runs on the coarse samples; the final fit uses all.
  const fitWith = (f: number, sidebands: ShareInputs['sidebands'], on = coarse, residualOnly = on === coarse, modelLines = lines) =>
    fitOrderPowers(on.y, on.nu, modelLines, {
      finesse: f,
      sidebands,
      sigmaV: input.sigmaV,
      // Every sample of the windows is modelled, whatever the split: the residuals then compare across splits.
      supportLinewidths: (SUPPORT_LINEWIDTHS / finesse + 2 * reachFsr) * f,
      stepFsr: on.stepFsr,
      background: on.background,
      residualOnly,
    })
  let sidebands = input.sidebands
  let fittedFinesse = parabolicMinimum((f) => fitWith(f, sidebands).reducedChiSquare, finesse, 0.85 * finesse, 1.18 * finesse)
  if (sidebands) {
    for (let round = 0; round < 2; round++) {
      const base: { offsetFsr: number; ratio: number } = sidebands
      const ratio = goldenSectionMinimum((r) => fitWith(fittedFinesse, { ...base, ratio: r - 1e-3 }).reducedChiSquare, 1e-3, 2 * base.ratio + 0.1, 11) - 1e-3
      sidebands = { ...base, ratio: Math.max(0, ratio) }
      fittedFinesse = parabolicMinimum((f) => fitWith(f, sidebands).reducedChiSquare, finesse, 0.85 * finesse, 1.18 * finesse)
    }
  }
  // Split orders leave the unsplit model short of the data about the transverse lines only (see
  // transverseMisfit). Only then are splits tried, on windows widened to hold them.
  let splitFsr = 0
  if (input.splitReachFsr && input.splitReachFsr > 0 && transverseMisfit(coarse, lines, (on) => fitWith(fittedFinesse, sidebands, on, true), Math.min(8 / fittedFinesse, 0.1))) {
    const wide = lineProblem(input)
    const previous = { all, coarse, reachFsr }
    ;({ all, coarse } = wide)
    reachFsr = input.splitReachFsr
    const found = searchSplit(wide, input, (candidate) => {
      const fit = fitWith(fittedFinesse, sidebands, coarse, true, candidate)
      return { chiSquare: fit.reducedChiSquare * (coarse.y.length - candidate.length - 3), parameters: candidate.length }
    }, fittedFinesse)
    if (found > 0) {
      splitFsr = found
      lines = splitLines(wide.lines, wide.predictedNu, found)
      fittedFinesse = parabolicMinimum((f) => fitWith(f, sidebands).reducedChiSquare, fittedFinesse, 0.85 * finesse, 1.18 * finesse)
    } else {
      ;({ all, coarse, reachFsr } = previous)
    }
  }
  const { y } = all
  if (coarse.y.length < y.length) {
    // The coarse samples place the minimum to about a percent; one parabola through all samples at ±1.5 %
    // takes the rest of the information (every sample counts for the width).
    const h = 0.015
    const at = (f: number) => fitWith(f, sidebands, all, true).reducedChiSquare
    const [fm, f0, fp] = [at(fittedFinesse * Math.exp(-h)), at(fittedFinesse), at(fittedFinesse * Math.exp(h))]
    const curvature = fp - 2 * f0 + fm
    if (curvature > 0) fittedFinesse *= Math.exp(Math.min(h, Math.max(-h, (-h * (fp - fm)) / (2 * curvature))))
  }
  let fit = fitWith(fittedFinesse, sidebands, all)
  const q = input.quantumV ?? 0
  if (q > 0 && input.sigmaV < COARSE_DIGITISER_SIGMA * q) {
    fit = fitAboveFloor(fit, all, lines, q, (on) => fitWith(fittedFinesse, sidebands, on, false), {
      finesse: fittedFinesse, sidebands, supportLinewidths: (SUPPORT_LINEWIDTHS / finesse + 2 * reachFsr) * fittedFinesse,
    })
  }
  const useHeight = input.preferHeight && fit.reducedChiSquare <= MAX_LINE_CHI_SQUARE
  const m = lines.length
  // Per order: the summed heights with their covariance (the matched filter: the best detector in white noise)
  // and the summed areas with their own errors (areas of separate windows taken as independent, common practice).
  const sums = new Map<number, { value: number; variance: number; heightSum: number; heightVariance: number }>()
  for (const order of input.orders) {
    const { heightSum, heightVariance } = orderHeightSums(lines, fit, order)
    let areaSum = 0
    let areaVariance = 0
    for (let j = 0; j < m; j++) {
      if (!lines[j].counted || lines[j].order !== order) continue
      areaSum += fit.lines[j].areaHeightV
      areaVariance += fit.lines[j].areaHeightErrorV ** 2
    }
    sums.set(order, useHeight
      ? { value: heightSum, variance: heightVariance, heightSum, heightVariance }
      : { value: areaSum, variance: areaVariance, heightSum, heightVariance })
  }
  // Report an order (always TEM00) when the lines at its places stand out of the noise by the matched filter or
  // by their area, and the measure used is positive.
  const significant = (value: number, variance: number) => value > REPORT_SIGNIFICANCE * Math.sqrt(Math.max(variance, 0))
  const reported = input.orders.filter((order) => {
    const s = sums.get(order)!
    return order === 0 ? s.value > 0 : s.value > 0 && (significant(s.heightSum, s.heightVariance) || significant(s.value, s.variance))
  })
  // The total counts every order measured, reported or not: leaving out the orders below the noise would push the
  // TEM00 fraction up by their power. A power cannot be negative: an estimate that noise pushed below zero counts as
  // zero, so that it never raises the TEM00 fraction (common practice; it costs the empty orders a small bias up).
  let total = 0
  for (const order of input.orders) total += Math.max(0, sums.get(order)!.value)
  if (!(sums.get(0)!.value > 0) || !(total > 0)) throw new EngineError('no_resonances', 'No carrier resonance could be measured in the selected sweep')
  const orders: Record<string, number> = {}
  for (const order of reported) orders[String(order)] = sums.get(order)!.value / total
  let belowNoise = 0
  for (const order of input.orders) if (!reported.includes(order)) belowNoise += Math.max(0, sums.get(order)!.value) / total
  const fundamentalFraction = Math.min(1, orders['0'] ?? 0)
  // First-order error propagation of P_N / Σ P (Bevington & Robinson, "Data Reduction and Error Analysis", §3.2):
  // with heights, through the full covariance of the line heights (the slow background they share correlates
  // them); with areas, orders taken as independent (common practice).
  const shareError = (order: number): number => {
    const share = sums.get(order)!.value / total
    let variance = 0
    if (useHeight) {
      const gradient = lines.map((l) => (l.counted && input.orders.includes(l.order) ? ((l.order === order ? 1 : 0) - share) / total : 0))
      for (let j = 0; j < m; j++) {
        if (gradient[j] === 0) continue
        for (let l = 0; l < m; l++) if (gradient[l] !== 0) variance += gradient[j] * fit.covariance[j * m + l] * gradient[l]
      }
    } else {
      for (const other of input.orders) variance += (((other === order ? 1 : 0) - share) / total) ** 2 * Math.max(sums.get(other)!.variance, 0)
    }
    return Math.sqrt(Math.max(variance, 0))
  }
  const orderEstimates = input.orders.map((order) => {
    const s = sums.get(order)!
    return {
      order,
      // Clamped like the total (a negative power reads 0); the significance keeps the sign the fit gave.
      share: Math.max(0, s.value) / total,
      shareError: shareError(order),
      significance: s.variance > 0 ? s.value / Math.sqrt(s.variance) : null,
      reported: reported.includes(order),
    }
  })
  // The scatter between FSR periods holds what the fit's covariance cannot: input power or laser modes changing from
  // one period to the next. With two or more whole periods, when the periods scatter more than the noise allows
  // (their variance against the covariance's, above the 95 % point of χ²/ν), the standard error of their mean
  // fraction (Bevington & Robinson, §4.1) is the stated error.
  const covarianceError = orderEstimates.find((e) => e.order === 0)!.shareError
  const scatter = periodScatterError(lines, (j) => Math.max(0, useHeight ? fit.lines[j].heightV : fit.lines[j].areaHeightV), input.firstIndex, input.direction)
  const fundamentalError = scatter !== null && scatter.error ** 2 > chiSquare95PerDegree(scatter.periods - 1) * covarianceError ** 2 ? scatter.error : covarianceError
  const tolerance = Math.max(3 / finesse, 0.005)
  return {
    orders,
    fundamentalFraction,
    fundamentalFractionError: Number.isFinite(fundamentalError) ? fundamentalError : null,
    splitFsr,
    belowNoiseShare: belowNoise,
    orderEstimates: orderEstimates.map((e) => ({ ...e, shareError: Number.isFinite(e.shareError) ? e.shareError : null, significance: e.significance !== null && Number.isFinite(e.significance) ? e.significance : null })),
    measure: useHeight ? 'height' : 'area',
    reducedChiSquare: Number.isFinite(fit.reducedChiSquare) ? fit.reducedChiSquare : null,
    finesse: Number.isFinite(fit.reducedChiSquare) ? fittedFinesse : null,
    shareOfPeak: (order, positionFsr) => {
      if (!(String(order) in orders)) return 0
      for (let j = 0; j < m; j++) {
        if (lines[j].order !== order || !lines[j].counted || Math.abs(lines[j].nu - positionFsr) > tolerance) continue
        return (useHeight ? fit.lines[j].heightV : fit.lines[j].areaHeightV) / total
      }
      return 0
    },
  }
}

/**
 * Standard error of the TEM00 fraction from its scatter between whole FSR periods: the fraction of each period
 * (TEM00 over all counted lines in it), their standard deviation over √periods. Null with fewer than two periods.
 */
function periodScatterError(lines: PredictedLine[], measureOf: (j: number) => number, firstIndex: number, direction: 'up' | 'down'): { error: number; periods: number } | null {
  const periods = new Map<number, { fundamental: number; all: number }>()
  lines.forEach((line, j) => {
    if (!line.counted) return
    const offset = direction === 'up' ? line.nu - firstIndex : firstIndex - line.nu
    // A TEM00 line moved to where its resonance was found may sit a hair below its whole number.
    const period = Math.floor(offset + 0.005)
    const p = periods.get(period) ?? { fundamental: 0, all: 0 }
    const v = measureOf(j)
    p.all += v
    if (line.order === 0) p.fundamental += v
    periods.set(period, p)
  })
  const fractions = [...periods.values()].filter((p) => p.all > 0).map((p) => p.fundamental / p.all)
  if (fractions.length < 2) return null
  const mean = fractions.reduce((a, b) => a + b, 0) / fractions.length
  const variance = fractions.reduce((a, f) => a + (f - mean) ** 2, 0) / (fractions.length - 1)
  return { error: Math.sqrt(variance / fractions.length), periods: fractions.length }
}

/** The 95 % point of χ²/ν for ν degrees of freedom (Wilson & Hilferty, Proc. Natl. Acad. Sci. 17, 684 (1931)). */
function chiSquare95PerDegree(degrees: number): number {
  const a = 2 / (9 * degrees)
  return (1 - a + 1.645 * Math.sqrt(a)) ** 3
}

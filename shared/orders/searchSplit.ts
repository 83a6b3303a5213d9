import { goldenSectionMinimum } from '../fit/goldenSectionMinimum'
import type { OrderPowerFit, PredictedLine } from './fitOrderPowers'
import type { LineProblem } from './lineProblem'
import type { ShareInputs } from './measureOrderShares'

/**
 * Astigmatism gives the two transverse axes different Gouy phases ψx, ψy, so HG_mn resonates at
 * (m + ½)ψx/π + (n + ½)ψy/π: order N = m + n splits into N + 1 lines at (m − n)·Δ/2 about its mean place,
 * Δ = (ψx − ψy)/π (Siegman, "Lasers" (1986), ch. 20). Each line gets its own height (the beam decides how the
 * order's power divides between HG_mn), and the order's power is their sum. Orders keep their predicted places
 * (a resonance found nearby may be one of the split lines).
 */
export function splitLines(lines: PredictedLine[], predictedNu: number[], splitFsr: number): PredictedLine[] {
  return lines.flatMap((line, j) => {
    if (line.order === 0 || !(splitFsr > 0)) return [line]
    return Array.from({ length: line.order + 1 }, (_, k) => ({ ...line, nu: predictedNu[j] + (k - line.order / 2) * splitFsr }))
  })
}

/**
 * Whether the line model fits the samples about the transverse lines worse than those about the TEM00 lines:
 * χ²ᵥ near orders ≥ 1 above χ²ᵥ near TEM00 by more than four standard deviations √(2/ν) of the former
 * (Bevington & Robinson, "Data Reduction and Error Analysis", §11.1). Shape changes that every order shares
 * (ringing, detector low-pass, a misjudged noise level) raise both; a split order raises only the first.
 */
export function transverseMisfit(
  on: { y: Float64Array; nu: Float64Array; stepFsr: Float64Array; background: { x: Float64Array; degree: number } },
  lines: PredictedLine[],
  fit: (subset: { y: Float64Array; nu: Float64Array; stepFsr: Float64Array; background: { x: Float64Array; degree: number } }) => OrderPowerFit,
  nearFsr: number,
): boolean {
  const sorted = lines.slice().sort((a, b) => a.nu - b.nu)
  // The nearest line by bisection (ν may rise or fall along the samples).
  const nearestTo = (v: number): PredictedLine | undefined => {
    let lo = 0
    let hi = sorted.length
    while (lo < hi) {
      const mid = (lo + hi) >> 1
      if (sorted[mid].nu < v) lo = mid + 1
      else hi = mid
    }
    const above = sorted[lo]
    const below = sorted[lo - 1]
    if (!above) return below
    if (!below) return above
    return v - below.nu <= above.nu - v ? below : above
  }
  const pick = (transverse: boolean) => {
    const keep: number[] = []
    for (let i = 0; i < on.nu.length; i++) {
      const v = on.nu[i]
      const nearest = nearestTo(v)
      if (nearest && Math.abs(nearest.nu - v) <= nearFsr && (nearest.order > 0) === transverse) keep.push(i)
    }
    const take = (a: Float64Array) => Float64Array.from(keep, (i) => a[i])
    return { count: keep.length, subset: { y: take(on.y), nu: take(on.nu), stepFsr: take(on.stepFsr), background: { x: take(on.background.x), degree: on.background.degree } } }
  }
  const transverse = pick(true)
  const fundamental = pick(false)
  if (transverse.count < 50 || fundamental.count < 50) return false
  const chiTransverse = fit(transverse.subset).reducedChiSquare
  const chiFundamental = fit(fundamental.subset).reducedChiSquare
  return chiTransverse > chiFundamental + 4 * Math.sqrt(2 / transverse.count)
}

/** Splits tried, in linewidths, from half a linewidth (below it the lines blur into one) to the reach allowed. */
const SPLIT_GRID_LINEWIDTHS = [0.5, 1, 2, 4, 8]

/**
 * The astigmatic split Δ (FSR) that the data support, or 0: χ² of the line model on a grid of splits, kept only
 * when it beats the unsplit model by more than the Bayesian information criterion's price of the extra heights,
 * k·ln n (Schwarz, Ann. Statist. 6, 461 (1978)), then refined by golden section on a log scale.
 */
export function searchSplit(
  problem: LineProblem,
  input: ShareInputs,
  chiSquareOf: (lines: PredictedLine[]) => { chiSquare: number; parameters: number },
  finesse: number,
): number {
  const maxOrder = Math.max(...input.orders)
  if (!(maxOrder >= 1)) return 0
  const limit = (2 * (input.splitReachFsr ?? 0)) / maxOrder
  const n = problem.coarse.y.length
  const unsplit = chiSquareOf(problem.lines)
  const score = (splitFsr: number) => {
    const trial = chiSquareOf(splitLines(problem.lines, problem.predictedNu, splitFsr))
    return trial.chiSquare + (trial.parameters - unsplit.parameters) * Math.log(n)
  }
  let best = 0
  let bestScore = unsplit.chiSquare
  for (const linewidths of SPLIT_GRID_LINEWIDTHS) {
    const splitFsr = linewidths / finesse
    if (splitFsr > limit) break
    const trial = score(splitFsr)
    if (trial < bestScore) {
      best = splitFsr
      bestScore = trial
    }
  }
  if (best === 0) return 0
  return goldenSectionMinimum(score, Math.max(0.5 / finesse, best / 2), Math.min(limit, best * 2), 8)
}

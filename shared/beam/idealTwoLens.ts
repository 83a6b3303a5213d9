import { beamParameterAt } from './beamParameterAt'
import type { IdealLens } from './idealSingleLens'
import { twoLensCoupling } from './twoLensCoupling'
import type { BeamAxis, MatchingPath } from './types'

export interface IdealTwoLens {
  lenses: [IdealLens, IdealLens]
  coupling: number
  /** Lowest coupling with each lens off by −tol, 0 or +tol. */
  worstCoupling: number
}

export interface IdealTwoLensOptions {
  /** Smallest |f| worth proposing, mm. @default 10 */
  minFocalLengthMm?: number
  /** Largest |f| worth proposing, mm. @default 2000 */
  maxFocalLengthMm?: number
  /** Lens position tolerance used to rank the solutions, mm. @default 1 */
  toleranceMm?: number
  /** How many distinct solutions to return. @default 5 */
  count?: number
}

/**
 * Exact two-lens solutions with free focal lengths: for lens positions zA < zB the first lens must make the beam's
 * spot at zB equal the mode's spot there (a thin lens cannot change the spot size), and the second lens then fixes
 * the curvature. With 1/q = s − i v just after lens A (s = 1/R_A − 1/f_A) and distance d, the spot condition
 * w(zB)² = w_mode(zB)² reduces to d² s² + 2 d s + 1 + d² v² − K = 0, K = v / bₜ (bₜ = −Im 1/q of the mode at zB), so
 * s = (−1 ± √(K − d² v²)) / d (derived here from the ABCD law; Kogelnik & Li, Appl. Opt. 5, 1550 (1966)).
 * Every pair of grid positions is solved; solutions are ranked by coupling within ±tolerance and kept when distinct.
 */
export function idealTwoLens(
  path: MatchingPath,
  positions: Float64Array,
  minSpacingMm: number,
  options: IdealTwoLensOptions = {},
): IdealTwoLens[] {
  const { minFocalLengthMm = 10, maxFocalLengthMm = 2000, toleranceMm = 1, count = 5 } = options
  const { beam } = path
  const candidates: IdealTwoLens[] = []
  const axes = beam.x === beam.y || sameAxis(beam.x, beam.y) ? [beam.x] : [beam.x, beam.y]
  for (let a = 0; a < positions.length; a++) {
    for (let b = a + 1; b < positions.length; b++) {
      const zA = positions[a]
      const zB = positions[b]
      if (zB - zA < minSpacingMm - 1e-9) continue
      let bestHere: IdealTwoLens | null = null
      for (const axis of axes) {
        for (const [pA, pB] of solve(path, axis, zA, zB)) {
          const fA = 1 / pA
          const fB = 1 / pB
          if (!plausible(fA, minFocalLengthMm, maxFocalLengthMm) || !plausible(fB, minFocalLengthMm, maxFocalLengthMm)) continue
          const coupling = twoLensCoupling(path, pA, zA, pB, zB)
          let worst = coupling
          for (let da = -1; da <= 1; da++) {
            for (let db = -1; db <= 1; db++) worst = Math.min(worst, twoLensCoupling(path, pA, zA + da * toleranceMm, pB, zB + db * toleranceMm))
          }
          const found: IdealTwoLens = { lenses: [{ zMm: zA, focalLengthMm: fA }, { zMm: zB, focalLengthMm: fB }], coupling, worstCoupling: worst }
          if (bestHere === null || rank(found, bestHere) < 0) bestHere = found
        }
      }
      if (bestHere !== null) candidates.push(bestHere)
    }
  }
  candidates.sort(rank)
  const chosen: IdealTwoLens[] = []
  const span = positions.length > 1 ? positions[positions.length - 1] - positions[0] : 1
  for (const c of candidates) {
    if (chosen.length >= count) break
    // Distinct: positions at least 5 % of the allowed span apart, or focal lengths differing by more than 10 %.
    const similar = chosen.some(
      (o) =>
        Math.abs(o.lenses[0].zMm - c.lenses[0].zMm) < 0.05 * span &&
        Math.abs(o.lenses[1].zMm - c.lenses[1].zMm) < 0.05 * span &&
        Math.abs(o.lenses[0].focalLengthMm / c.lenses[0].focalLengthMm - 1) < 0.1 &&
        Math.abs(o.lenses[1].focalLengthMm / c.lenses[1].focalLengthMm - 1) < 0.1,
    )
    if (!similar) chosen.push(c)
  }
  // An astigmatic beam has no exact match with spherical lenses: polish each chosen pair's focal lengths so the
  // product of the x and y couplings is as high as those two positions allow.
  return axes.length === 1 ? chosen : chosen.map((c) => polish(path, c, toleranceMm))
}

/** Nested golden-section search over the two lens powers (±30 % around the per-axis solution), positions fixed. */
function polish(path: MatchingPath, c: IdealTwoLens, toleranceMm: number): IdealTwoLens {
  const [a, b] = c.lenses
  const bestB = (pA: number): number => goldenMax((pB) => twoLensCoupling(path, pA, a.zMm, pB, b.zMm), 1 / b.focalLengthMm)
  const pA = goldenMax((p) => twoLensCoupling(path, p, a.zMm, bestB(p), b.zMm), 1 / a.focalLengthMm)
  const pB = bestB(pA)
  const coupling = twoLensCoupling(path, pA, a.zMm, pB, b.zMm)
  if (!(coupling > c.coupling)) return c
  let worst = coupling
  for (let da = -1; da <= 1; da++) {
    for (let db = -1; db <= 1; db++) worst = Math.min(worst, twoLensCoupling(path, pA, a.zMm + da * toleranceMm, pB, b.zMm + db * toleranceMm))
  }
  return { lenses: [{ zMm: a.zMm, focalLengthMm: 1 / pA }, { zMm: b.zMm, focalLengthMm: 1 / pB }], coupling, worstCoupling: worst }
}

function goldenMax(f: (x: number) => number, center: number): number {
  let lo = center - 0.3 * Math.abs(center)
  let hi = center + 0.3 * Math.abs(center)
  const g = (Math.sqrt(5) - 1) / 2
  for (let it = 0; it < 60; it++) {
    const m1 = hi - g * (hi - lo)
    const m2 = lo + g * (hi - lo)
    if (f(m1) >= f(m2)) hi = m2
    else lo = m1
  }
  return (lo + hi) / 2
}

/** Better first: higher coupling within tolerance, then higher coupling. */
function rank(p: IdealTwoLens, r: IdealTwoLens): number {
  return r.worstCoupling - p.worstCoupling || r.coupling - p.coupling
}

function plausible(f: number, min: number, max: number): boolean {
  return Number.isFinite(f) && Math.abs(f) >= min && Math.abs(f) <= max
}

function sameAxis(p: BeamAxis, r: BeamAxis): boolean {
  return p.waistRadiusMm === r.waistRadiusMm && p.waistPositionMm === r.waistPositionMm && p.m2 === r.m2
}

/** Lens powers (1/mm) that match this axis exactly with lenses at zA and zB; zero, one or two solutions. */
function solve(path: MatchingPath, axis: BeamAxis, zA: number, zB: number): [number, number][] {
  const { beam, target, cavityPlaneMm } = path
  const q = beamParameterAt(axis, beam.wavelengthNm, zA)
  const m = q.re * q.re + q.im * q.im
  const u = q.re / m
  const v = q.im / m
  const tRe = -target.waistFromEntranceMm - (cavityPlaneMm - zB)
  const tIm = target.rayleighRangeMm
  const tm = tRe * tRe + tIm * tIm
  const at = tRe / tm
  const bt = tIm / tm
  const d = zB - zA
  const disc = v / bt - d * d * v * v
  if (disc < 0) return []
  const out: [number, number][] = []
  for (const sign of disc === 0 ? [1] : [1, -1]) {
    const s = (-1 + sign * Math.sqrt(disc)) / d
    const pA = u - s
    // q just after lens A is 1/(s − i v); move it by d and read Re(1/q) there.
    const den = s * s + v * v
    const re = s / den + d
    const im = v / den
    const mm = re * re + im * im
    const pB = re / mm - at
    out.push([pA, pB])
  }
  return out
}

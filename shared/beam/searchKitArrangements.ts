import type { MatchingPath } from './types'

/** The best position found for one lens, or for one ordered pair of lenses. */
export interface KitCandidate {
  /** Indices into the lens list, in path order (one or two). */
  lensIndices: number[]
  /** Positions (mm) in the same order. */
  zMm: number[]
  coupling: number
}

export interface KitSearch {
  single: KitCandidate[]
  pairs: KitCandidate[]
  /** How many (lens choice, positions) arrangements were evaluated. */
  evaluated: { oneLens: number; twoLens: number }
  /** How many first lenses had all their pairs searched: all K, unless `shouldStop` cut the search short. */
  firstLensesSearched: number
}

/**
 * Exhaustive search of one- and two-lens arrangements on a grid of allowed positions; per lens, and per ordered
 * pair of lenses, the position(s) of highest coupling. The inner loop is allocation-free: the target mode is traced
 * back through the second lens once per (lens, position), the beam forward through the first lens once per
 * (lens, position), and each pair then costs one free-space step and two overlap evaluations — the coupling does not
 * depend on the plane where two q are compared (ABCD invariance; Kogelnik & Li, Appl. Opt. 5, 1550 (1966)).
 * `powers` are 1/f (1/mm); `counts` decide whether a lens may be used twice; `positions` ascend. `shouldStop` is
 * asked after each first lens (a time budget): when it answers true the pairs found so far are returned.
 */
export function searchKitArrangements(
  path: MatchingPath,
  powers: Float64Array,
  counts: Int32Array,
  positions: Float64Array,
  minSpacingMm: number,
  shouldStop: () => boolean = () => false,
): KitSearch {
  const K = powers.length
  const P = positions.length
  const { beam, target, cavityPlaneMm } = path
  const lambdaMm = beam.wavelengthNm * 1e-6
  const x0Re = -beam.x.waistPositionMm
  const x0Im = (Math.PI * beam.x.waistRadiusMm ** 2) / (beam.x.m2 * lambdaMm)
  const y0Re = -beam.y.waistPositionMm
  const y0Im = (Math.PI * beam.y.waistRadiusMm ** 2) / (beam.y.m2 * lambdaMm)
  const circular = x0Re === y0Re && x0Im === y0Im
  const tIm = target.rayleighRangeMm

  // Target q just before lens j at position p (target traced back through the lens: power −P_j).
  const backRe = new Float64Array(K * P)
  const backIm = new Float64Array(K * P)
  // Beam q just after lens i at position p, per axis.
  const axRe = new Float64Array(K * P)
  const axIm = new Float64Array(K * P)
  const ayRe = new Float64Array(K * P)
  const ayIm = new Float64Array(K * P)
  for (let j = 0; j < K; j++) {
    for (let p = 0; p < P; p++) {
      const k = j * P + p
      lens(-target.waistFromEntranceMm - (cavityPlaneMm - positions[p]), tIm, -powers[j])
      // Kept as the q this target would have at path position 0 in free space (saves a load in the hot loop).
      backRe[k] = outRe - positions[p]
      backIm[k] = outIm
      lens(x0Re + positions[p], x0Im, powers[j])
      axRe[k] = outRe
      axIm[k] = outIm
      lens(y0Re + positions[p], y0Im, powers[j])
      ayRe[k] = outRe
      ayIm[k] = outIm
    }
  }

  const single: KitCandidate[] = []
  for (let j = 0; j < K; j++) {
    let best = -1
    let bestP = 0
    for (let p = 0; p < P; p++) {
      const k = j * P + p
      const v = overlapSquared(x0Re, x0Im, y0Re, y0Im, backRe[k], backIm[k])
      if (v > best) {
        best = v
        bestP = p
      }
    }
    if (P > 0) single.push({ lensIndices: [j], zMm: [positions[bestP]], coupling: Math.min(1, Math.sqrt(best)) })
  }

  // First position index that keeps the spacing, per first-lens position.
  const secondStart = new Int32Array(P)
  for (let p = 0, s = 0; p < P; p++) {
    while (s < P && positions[s] < positions[p] + minSpacingMm - 1e-9) s++
    secondStart[p] = Math.max(s, p + 1)
  }
  const bestValue = new Float64Array(K * K).fill(-1)
  const bestFirst = new Int32Array(K * K)
  const bestSecond = new Int32Array(K * K)
  let twoLens = 0
  let firstLensesSearched = 0
  for (let i = 0; i < K; i++) {
    if (i > 0 && shouldStop()) break
    firstLensesSearched = i + 1
    for (let pa = 0; pa < P; pa++) {
      const start = secondStart[pa]
      if (start >= P) continue
      const k = i * P + pa
      const zA = positions[pa]
      const bxRe = axRe[k] - zA
      const bxIm = axIm[k]
      const byRe = ayRe[k] - zA
      const byIm = ayIm[k]
      for (let j = 0; j < K; j++) {
        if (j === i && counts[i] < 2) continue
        const pair = i * K + j
        const base = j * P
        twoLens += P - start
        const best = bestValue[pair]
        const bestAt = circular
          ? scanCircular(bxRe, bxIm, best / bxIm, backRe, backIm, base, start, P)
          : scanAstigmatic(bxRe, bxIm, byRe, byIm, best, backRe, backIm, base, start, P)
        if (bestAt >= 0) {
          bestValue[pair] = scanBest
          bestFirst[pair] = pa
          bestSecond[pair] = bestAt
        }
      }
    }
  }
  const pairs: KitCandidate[] = []
  for (let pair = 0; pair < K * K; pair++) {
    if (bestValue[pair] < 0) continue
    pairs.push({
      lensIndices: [Math.floor(pair / K), pair % K],
      zMm: [positions[bestFirst[pair]], positions[bestSecond[pair]]],
      coupling: Math.min(1, 4 * bestValue[pair]), // 4 Im q1 Im q2 / |q1* − q2|² (the factor 4 was left out of the loop)
    })
  }
  return { single, pairs, evaluated: { oneLens: K * P, twoLens }, firstLensesSearched }
}

// Best value found by the last scan (module-level so the hot loop returns one number and allocates nothing).
let scanBest = 0

/**
 * Circular beam: best second-lens position for one first-lens placement. Maximises tI / ((dRe)² + (sIm)²), the
 * coupling divided by 4 Im q_beam, compared by cross-multiplication so the loop has no division.
 * Returns the index, or −1 when nothing beats `floor` (already divided by Im q_beam).
 */
function scanCircular(
  bRe: number,
  bIm: number,
  floor: number,
  backRe: Float64Array,
  backIm: Float64Array,
  base: number,
  start: number,
  end: number,
): number {
  let bestNum = floor
  let bestDen = 1
  let bestAt = -1
  for (let pb = start; pb < end; pb++) {
    const tI = backIm[base + pb]
    const dRe = bRe - backRe[base + pb]
    const sIm = bIm + tI
    const den = dRe * dRe + sIm * sIm
    if (tI * bestDen > bestNum * den) {
      bestNum = tI
      bestDen = den
      bestAt = pb
    }
  }
  if (bestAt >= 0) scanBest = (bIm * bestNum) / bestDen
  return bestAt
}

/** Astigmatic beam: as `scanCircular` with the product of the x and y overlaps (value = coupling / 4). */
function scanAstigmatic(
  xRe: number,
  xIm: number,
  yRe: number,
  yIm: number,
  floor: number,
  backRe: Float64Array,
  backIm: Float64Array,
  base: number,
  start: number,
  end: number,
): number {
  let best = floor < 0 ? -1 : floor * floor // squared: the loop compares (coupling / 4)²
  let bestAt = -1
  const xy = xIm * yIm
  for (let pb = start; pb < end; pb++) {
    const tRe = backRe[base + pb]
    const tI = backIm[base + pb]
    const dx = xRe - tRe
    const sx = xIm + tI
    const dy = yRe - tRe
    const sy = yIm + tI
    const v = (xy * tI * tI) / ((dx * dx + sx * sx) * (dy * dy + sy * sy))
    if (v > best) {
      best = v
      bestAt = pb
    }
  }
  if (bestAt >= 0) scanBest = Math.sqrt(best)
  return bestAt
}

// Scratch output of `lens` (module-level so the set-up loop allocates nothing).
let outRe = 0
let outIm = 0

/** Thin lens of power p on q = re + i im: q / (1 − p q). Kogelnik & Li, Appl. Opt. 5, 1550 (1966). */
function lens(re: number, im: number, p: number): void {
  const dRe = 1 - p * re
  const dIm = -p * im
  const den = dRe * dRe + dIm * dIm
  outRe = (re * dRe + im * dIm) / den
  outIm = (im * dRe - re * dIm) / den
}

/** η_x η_y for beam axes (x, y) against one circular target q, all at one plane: the square of the coupling. */
function overlapSquared(xRe: number, xIm: number, yRe: number, yIm: number, tRe: number, tIm: number): number {
  const ex = (4 * xIm * tIm) / ((xRe - tRe) ** 2 + (xIm + tIm) ** 2)
  const ey = (4 * yIm * tIm) / ((yRe - tRe) ** 2 + (yIm + tIm) ** 2)
  return ex * ey
}

import { beamParameterAt } from './beamParameterAt'
import type { BeamAxis, MatchingPath } from './types'

export interface IdealLens {
  zMm: number
  focalLengthMm: number
}

export interface IdealSingleLens {
  lens: IdealLens
  coupling: number
}

/**
 * The best single thin lens of free focal length anywhere in the allowed intervals. A thin lens changes only
 * Re(1/q), so with 1/q = a − i b the coupling at the lens plane is 4 b bₜ / ((a − 1/f − aₜ)² + (b + bₜ)²): the best
 * focal length makes the wavefront curvatures agree and the coupling then depends only on the two spot sizes there,
 * 4 b bₜ / (b + bₜ)². An exact match exists where the beam and the mode have equal radii at the lens (the
 * Kogelnik–Li single-lens mode-matching solutions). Source: Kogelnik & Li, Appl. Opt. 5, 1550 (1966).
 */
export function idealSingleLens(path: MatchingPath, intervalsMm: readonly [number, number][], samplesPerInterval = 400): IdealSingleLens | null {
  let best: IdealSingleLens | null = null
  const consider = (zMm: number): void => {
    const found = bestAtPlane(path, zMm)
    if (best === null || found.coupling > best.coupling) best = { lens: { zMm, focalLengthMm: 1 / found.power }, coupling: found.coupling }
  }
  // Exact solutions first: planes where an axis and the mode have equal spot sizes, found as roots of a quadratic
  // (more precise than maximising the flat top of the coupling).
  for (const root of [...equalSpotPlanes(path, path.beam.x), ...equalSpotPlanes(path, path.beam.y)]) {
    if (intervalsMm.some(([from, to]) => root >= from && root <= to)) consider(root)
  }
  for (const [from, to] of intervalsMm) {
    if (!(to >= from)) continue
    const n = to > from ? samplesPerInterval : 1
    const h = n > 1 ? (to - from) / (n - 1) : 0
    let bestK = 0
    let bestValue = -1
    for (let k = 0; k < n; k++) {
      const v = bestAtPlane(path, from + k * h).coupling
      if (v > bestValue) {
        bestValue = v
        bestK = k
      }
    }
    // Golden-section refinement around the best sample.
    let lo = Math.max(from, from + (bestK - 1) * h)
    let hi = Math.min(to, from + (bestK + 1) * h)
    const g = (Math.sqrt(5) - 1) / 2
    for (let it = 0; it < 80 && hi - lo > 1e-9; it++) {
      const m1 = hi - g * (hi - lo)
      const m2 = lo + g * (hi - lo)
      if (bestAtPlane(path, m1).coupling >= bestAtPlane(path, m2).coupling) hi = m2
      else lo = m1
    }
    consider((lo + hi) / 2)
  }
  return best
}

/**
 * Planes where one beam axis and the mode have equal spot sizes: |q|²/Im q equal for both, i.e.
 * ((z − z_b)² + z_Rb²)/z_Rb = ((z − z_t)² + z_Rt²)/z_Rt, a quadratic in z.
 */
function equalSpotPlanes(path: MatchingPath, axis: BeamAxis): number[] {
  const zb = axis.waistPositionMm
  const zRb = beamParameterAt(axis, path.beam.wavelengthNm, 0).im
  const zt = path.cavityPlaneMm + path.target.waistFromEntranceMm
  const zRt = path.target.rayleighRangeMm
  const a = 1 / zRb - 1 / zRt
  const b = (-2 * zb) / zRb + (2 * zt) / zRt
  const c = (zb * zb) / zRb - (zt * zt) / zRt + zRb - zRt
  if (Math.abs(a) < 1e-15 * (1 / zRb + 1 / zRt)) return b === 0 ? [] : [-c / b]
  const disc = b * b - 4 * a * c
  if (disc < 0) return []
  const sq = Math.sqrt(disc)
  // Numerically stable pair of roots.
  const qq = -0.5 * (b + Math.sign(b || 1) * sq)
  return qq === 0 ? [0] : [qq / a, c / qq]
}

/** Best lens power at one plane and the coupling it reaches (both axes; one spherical lens for both). */
export function bestAtPlane(path: MatchingPath, zMm: number): { power: number; coupling: number } {
  const { beam, target, cavityPlaneMm } = path
  const inverseAt = (axis: BeamAxis) => {
    const q = beamParameterAt(axis, beam.wavelengthNm, zMm)
    const m = q.re * q.re + q.im * q.im
    return { a: q.re / m, b: q.im / m }
  }
  const tRe = -target.waistFromEntranceMm - (cavityPlaneMm - zMm)
  const tIm = target.rayleighRangeMm
  const tm = tRe * tRe + tIm * tIm
  const at = tRe / tm
  const bt = tIm / tm
  const x = inverseAt(beam.x)
  const y = inverseAt(beam.y)
  const eta = (a: number, b: number, power: number) => (4 * b * bt) / ((a - power - at) ** 2 + (b + bt) ** 2)
  const total = (power: number) => Math.sqrt(eta(x.a, x.b, power) * eta(y.a, y.b, power))
  let lo = Math.min(x.a - at, y.a - at)
  let hi = Math.max(x.a - at, y.a - at)
  // Each axis peaks at its own power; the product peaks between them.
  const g = (Math.sqrt(5) - 1) / 2
  for (let it = 0; it < 100 && hi - lo > 1e-15 * (1 + Math.abs(hi)); it++) {
    const m1 = hi - g * (hi - lo)
    const m2 = lo + g * (hi - lo)
    if (total(m1) >= total(m2)) hi = m2
    else lo = m1
  }
  const power = (lo + hi) / 2
  return { power, coupling: Math.min(1, total(power)) }
}

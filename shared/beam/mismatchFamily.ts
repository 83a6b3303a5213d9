import { EngineError } from '../errors'
import { assertArgument, assertPositive } from './assertions'

/** The mode the measured mismatch refers to (e.g. a `cavityEigenmodeBeam` result). */
export interface ReferenceMode {
  waistRadiusMm: number
  rayleighRangeMm: number
}

export interface MismatchFamilyOptions {
  /** Number of points around the family (a closed curve). @default 73 */
  points?: number
  /**
   * false: the order-2 share is taken as all the mismatch power, η = 1 − share (lowest order).
   * true: the share is the order-2 term of the exact series P(LG_p0) = (1 − M) M^p, so share = (1 − M) M.
   * @default false
   */
  includeHigherOrders?: boolean
}

export interface MismatchPoint {
  /** Position on the family: 0 = pure size error (beam waist larger), π = pure size error (smaller), π/2 and 3π/2 = the position-like quadrature. */
  phaseRad: number
  /** Beam waist / mode waist. */
  waistRatio: number
  waistRadiusMm: number
  /** Beam waist position minus mode waist position, mm (positive = the beam's waist lies further along the beam). */
  waistPositionErrorMm: number
}

export interface MismatchFamily {
  /** Coupling into TEM00 implied by the share, 1 − M. */
  coupling: number
  /** Mismatch power fraction M. */
  mismatch: number
  points: MismatchPoint[]
  /** Waist ratios that explain the share with no position error. */
  pureSize: { largerRatio: number; smallerRatio: number }
  /** |Δz| that explains the share with equal waists, mm. */
  purePositionMm: number
}

/**
 * All (waist-size ratio, waist-position error) pairs consistent with a measured order-2 power share: power alone
 * cannot tell size from position. With M = 1 − η the mismatch and ρ = √M e^{iφ}, the input beam's q at the mode's
 * waist is q = i z_R (1 + ρ) / (1 − ρ), because M = |q − q0|² / |q − q0*|² (q0 = i z_R the mode) and ρ is the
 * amplitude ratio c(LG10)/c(LG00) up to sign, real for a size error and imaginary for a position error.
 * Source: mismatch into order-2 (LG_p0, p = 1) modes: Anderson, Appl. Opt. 23, 2944 (1984) (from memory);
 * J. Miller and M. Evans, arXiv:1410.8773 (2014); series P(LG_p0) = (1 − M) M^p and the q form as derived and
 * checked in OPTICS-CHECKS §2(e) (overlap formula: Kogelnik 1964, from memory).
 */
export function mismatchFamily(order2Share: number, mode: ReferenceMode, options: MismatchFamilyOptions = {}): MismatchFamily {
  const { points = 73, includeHigherOrders = false } = options
  if (typeof order2Share !== 'number' || !Number.isFinite(order2Share) || order2Share < 0 || order2Share >= 1) {
    throw new EngineError('invalid_argument', `order2Share must be a fraction from 0 up to (not including) 1, got ${String(order2Share)}`)
  }
  assertPositive(mode?.waistRadiusMm, 'mode.waistRadiusMm')
  assertPositive(mode.rayleighRangeMm, 'mode.rayleighRangeMm')
  assertArgument(Number.isInteger(points) && points >= 3 && points <= 10000, 'points must be an integer from 3 to 10000')
  let mismatch = order2Share
  if (includeHigherOrders) {
    if (order2Share > 0.25) {
      throw new EngineError('invalid_argument', `An order-2 share of ${order2Share} exceeds 0.25, the most (1 − M) M can reach; the share cannot come from mode mismatch alone`)
    }
    mismatch = (1 - Math.sqrt(1 - 4 * order2Share)) / 2
  }
  const m = Math.sqrt(mismatch)
  const zR = mode.rayleighRangeMm
  const family: MismatchPoint[] = []
  for (let k = 0; k < points; k++) {
    const phaseRad = (2 * Math.PI * k) / (points - 1)
    const rRe = m * Math.cos(phaseRad)
    const rIm = m * Math.sin(phaseRad)
    // q = i zR (1 + ρ)/(1 − ρ), written out.
    const den = (1 - rRe) * (1 - rRe) + rIm * rIm
    const numRe = (1 + rRe) * (1 - rRe) - rIm * rIm
    const numIm = rIm * (1 - rRe) + (1 + rRe) * rIm
    const qRe = (-zR * numIm) / den
    const qIm = (zR * numRe) / den
    const waistRatio = Math.sqrt(qIm / zR)
    family.push({ phaseRad, waistRatio, waistRadiusMm: waistRatio * mode.waistRadiusMm, waistPositionErrorMm: -qRe })
  }
  return {
    coupling: 1 - mismatch,
    mismatch,
    points: family,
    pureSize: { largerRatio: Math.sqrt((1 + m) / (1 - m)), smallerRatio: Math.sqrt((1 - m) / (1 + m)) },
    purePositionMm: 2 * zR * Math.sqrt(mismatch / (1 - mismatch)),
  }
}

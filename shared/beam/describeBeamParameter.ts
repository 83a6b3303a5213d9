import type { Complex } from './complex'
import { wavelengthMm } from './wavelengthMm'

/** What a beam looks like at one plane. */
export interface BeamState {
  /** Beam parameter q at the plane, mm. */
  q: Complex
  /** 1/e² intensity radius of the real beam here (M × the embedded Gaussian's radius), mm. */
  radiusMm: number
  /** Wavefront radius of curvature R = 1/Re(1/q), mm; positive = diverging, Infinity at a waist. */
  curvatureRadiusMm: number
  /** Distance from this plane to the waist, mm; positive = the waist lies ahead (converging beam). */
  distanceToWaistMm: number
  /** Waist radius of the real beam, mm. */
  waistRadiusMm: number
  /** Rayleigh range, mm. */
  rayleighRangeMm: number
  /** Gouy phase arctan(z / z_R) relative to the waist, rad. */
  gouyPhaseRad: number
}

/**
 * Beam radius, wavefront curvature, waist and Gouy phase from q, using 1/q = 1/R − i M²λ/(π W²) for the real-beam
 * radius W (embedded-Gaussian form).
 * Source: Kogelnik & Li, Appl. Opt. 5, 1550 (1966); Siegman, "Lasers" (1986), ch. 17 and 20.
 */
export function describeBeamParameter(q: Complex, wavelengthNm: number, m2 = 1): BeamState {
  const lambdaMm = wavelengthMm(wavelengthNm) * m2
  const modulus2 = q.re * q.re + q.im * q.im
  return {
    q: { re: q.re, im: q.im },
    radiusMm: Math.sqrt((lambdaMm * modulus2) / (Math.PI * q.im)),
    curvatureRadiusMm: q.re === 0 ? Infinity : modulus2 / q.re,
    distanceToWaistMm: -q.re,
    waistRadiusMm: Math.sqrt((lambdaMm * q.im) / Math.PI),
    rayleighRangeMm: q.im,
    gouyPhaseRad: Math.atan2(q.re, q.im),
  }
}

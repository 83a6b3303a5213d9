import type { Complex } from './complex'
import type { BeamAxis } from './types'
import { wavelengthMm } from './wavelengthMm'

/**
 * Complex beam parameter q = (z − z_waist) + i z_R of one beam axis at path position `zMm` (free space, no lenses),
 * with z_R = π w0² / (M² λ): for M² > 1 this is the q of Siegman's embedded Gaussian, which shares z_R and the waist
 * position with the real beam and propagates by the same ABCD law.
 * Source: Kogelnik & Li, Appl. Opt. 5, 1550 (1966); embedded Gaussian: Siegman, "Lasers" (1986), ch. 17.
 */
export function beamParameterAt(axis: BeamAxis, wavelengthNm: number, zMm: number): Complex {
  return { re: zMm - axis.waistPositionMm, im: rayleighRangeMm(axis, wavelengthNm) }
}

/** Rayleigh range π w0² / (M² λ) of a beam axis, mm (Siegman, "Lasers" (1986), ch. 17). */
export function rayleighRangeMm(axis: BeamAxis, wavelengthNm: number): number {
  return (Math.PI * axis.waistRadiusMm * axis.waistRadiusMm) / (axis.m2 * wavelengthMm(wavelengthNm))
}

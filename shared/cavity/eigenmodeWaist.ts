import { assertPositive } from './assertions'
import { assertStable } from './assertStable'

export interface EigenmodeWaist {
  /** 1/e² intensity radius of the TEM00 waist, m. */
  radiusM: number
  /** Distance from mirror 1 to the waist, m; positive = towards mirror 2 (the waist may lie outside the cavity). */
  positionFromMirror1M: number
  /** Rayleigh range z_R = π w0² / λ, m. */
  rayleighRangeM: number
}

/**
 * TEM00 eigenmode of a stable two-mirror cavity in g-parameter form, D = g1 + g2 − 2 g1 g2:
 * z_R² = L² g1 g2 (1 − g1 g2) / D², z1 = L g2 (1 − g1) / D, w0² = λ z_R / π.
 * Source: Kogelnik & Li, Appl. Opt. 5, 1550 (1966); Siegman, "Lasers" (1986), ch. 19.
 * D = 0 inside the stable range only for the symmetric confocal cavity, where z_R = L/2 and the waist is central.
 */
export function eigenmodeWaist(lengthM: number, wavelengthM: number, g1: number, g2: number): EigenmodeWaist {
  assertPositive(lengthM, 'lengthM')
  assertPositive(wavelengthM, 'wavelengthM')
  assertStable(g1, g2)
  const product = g1 * g2
  const d = g1 + g2 - 2 * product
  let rayleighRangeM: number
  let positionFromMirror1M: number
  if (d === 0) {
    // assertStable only lets g1 = g2 = 0 through with D = 0: the symmetric confocal cavity.
    rayleighRangeM = lengthM / 2
    positionFromMirror1M = lengthM / 2
  } else {
    rayleighRangeM = (lengthM * Math.sqrt(product * (1 - product))) / Math.abs(d)
    positionFromMirror1M = (lengthM * g2 * (1 - g1)) / d
  }
  const radiusM = Math.sqrt((wavelengthM * rayleighRangeM) / Math.PI)
  return { radiusM, positionFromMirror1M, rayleighRangeM }
}

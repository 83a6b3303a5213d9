import { eigenmodeWaist } from './eigenmodeWaist'

export interface MirrorSpotRadii {
  /** 1/e² intensity radius of the TEM00 mode on mirror 1, m. */
  mirror1: number
  /** 1/e² intensity radius of the TEM00 mode on mirror 2, m. */
  mirror2: number
}

/**
 * TEM00 spot radii on the two mirrors, w(z) = w0 √(1 + (z/z_R)²) evaluated at each mirror; algebraically the same as
 * w1² = (λL/π) √(g2 / (g1 (1 − g1 g2))), but also finite for the symmetric confocal cavity where that form is 0/0.
 * Source: Kogelnik & Li, Appl. Opt. 5, 1550 (1966); Siegman, "Lasers" (1986), ch. 17 and 19.
 */
export function mirrorSpotRadii(lengthM: number, wavelengthM: number, g1: number, g2: number): MirrorSpotRadii {
  const waist = eigenmodeWaist(lengthM, wavelengthM, g1, g2)
  const at = (distanceFromWaistM: number): number =>
    waist.radiusM * Math.sqrt(1 + (distanceFromWaistM / waist.rayleighRangeM) ** 2)
  return {
    mirror1: at(waist.positionFromMirror1M),
    mirror2: at(lengthM - waist.positionFromMirror1M),
  }
}

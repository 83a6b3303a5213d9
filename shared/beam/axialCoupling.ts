import { assertFiniteNumber, assertPositive, assertWavelength } from './assertions'
import { wavelengthMm } from './wavelengthMm'

export interface AxialMismatch {
  /** Waist radius of the first beam (e.g. the cavity mode), mm. */
  waistRadius1Mm: number
  /** Waist radius of the second beam (e.g. the input), mm. */
  waistRadius2Mm: number
  /** Distance between the two waists along the axis, mm (the sign does not matter). */
  waistSeparationMm: number
  wavelengthNm: number
}

/**
 * Power coupling between two coaxial, circular TEM00 beams with different waist sizes and waist positions:
 * η = |∫E1* E2 dA|² / (∫|E1|² ∫|E2|²) = 4 / ((w1/w2 + w2/w1)² + (λ Δz / (π w1 w2))²).
 * Source: H. Kogelnik, "Coupling and conversion coefficients for optical modes" (1964) (from memory); Joyce &
 * DeLoach, Appl. Opt. 23, 4187 (1984) (from memory); derivation: the Gaussian overlap integral of two fields
 * exp(−ik r²/2q) evaluated at one plane (checked in tests against OPTICS-CHECKS §2(e)).
 */
export function axialCoupling(input: AxialMismatch): number {
  const { waistRadius1Mm: w1, waistRadius2Mm: w2, waistSeparationMm: dz, wavelengthNm } = input
  assertPositive(w1, 'waistRadius1Mm')
  assertPositive(w2, 'waistRadius2Mm')
  assertFiniteNumber(dz, 'waistSeparationMm')
  assertWavelength(wavelengthNm)
  const sizeTerm = w1 / w2 + w2 / w1
  const positionTerm = (wavelengthMm(wavelengthNm) * dz) / (Math.PI * w1 * w2)
  return 4 / (sizeTerm * sizeTerm + positionTerm * positionTerm)
}

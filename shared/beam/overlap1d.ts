import { abs2, add, complex, conj, div, inv, mul, sub, type Complex } from './complex'
import { wavelengthMm } from './wavelengthMm'

export interface Overlap1dOptions {
  /** Lateral offset of beam 2 relative to beam 1 at the common plane, mm. @default 0 */
  offsetMm?: number
  /** Tilt of beam 2 relative to beam 1 at the common plane, rad. @default 0 */
  tiltRad?: number
}

/**
 * One-dimensional power overlap of two Gaussian fields u_j(x) = exp(−ik x²/(2 q_j)) given at one common plane, beam 2
 * displaced by `offsetMm` and tilted by `tiltRad`: η = |∫u1* u2 dx|² / (∫|u1|² ∫|u2|²), evaluated in closed form
 * with ∫exp(−αx² + βx + γ) dx = √(π/α) exp(β²/4α + γ). For aligned beams it reduces to
 * η = 2 √(Im q1 Im q2) / |q1* − q2|; a circular beam's 2-D coupling is the product of its x and y overlaps.
 * Source: field form from Kogelnik & Li, Appl. Opt. 5, 1550 (1966); misalignment overlap as treated by Joyce &
 * DeLoach, Appl. Opt. 23, 4187 (1984) and Anderson, Appl. Opt. 23, 2944 (1984) (both from memory).
 */
export function overlap1d(q1: Complex, q2: Complex, wavelengthNm: number, options: Overlap1dOptions = {}): number {
  const { offsetMm = 0, tiltRad = 0 } = options
  const k = (2 * Math.PI) / wavelengthMm(wavelengthNm)
  const halfIk = complex(0, k / 2)
  const inv1c = conj(inv(q1))
  const inv2 = inv(q2)
  const alpha = mul(halfIk, sub(inv2, inv1c))
  const beta = mul(complex(0, k), add(mul(complex(offsetMm, 0), inv2), complex(tiltRad, 0)))
  const gamma = mul(complex(0, (-k * offsetMm * offsetMm) / 2), inv2)
  const exponent = add(div(mul(beta, beta), mul(complex(4, 0), alpha)), gamma)
  const b1 = -inv(q1).im
  const b2 = -inv2.im
  // |√(π/α)|² = π/|α|; norms ∫|u_j|² = √(π / (k b_j)).
  const overlap2 = (Math.PI / Math.sqrt(abs2(alpha))) * Math.exp(2 * exponent.re)
  return overlap2 / (Math.PI / (k * Math.sqrt(b1 * b2)))
}

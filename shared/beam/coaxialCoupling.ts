/**
 * Power coupling of two coaxial circular TEM00 beams from their beam parameters at one common plane, on plain numbers
 * (no allocation, for search loops): η = 4 Im q1 Im q2 / |q1* − q2|². The value does not depend on the plane, since
 * any ABCD system maps both q alike. The 1-D (one-axis) overlap is √η, and an astigmatic beam couples with
 * η = √(η(q1x, q2x) · η(q1y, q2y)).
 * Source: Kogelnik, "Coupling and conversion coefficients for optical modes" (1964) (from memory); the q form as
 * given in OPTICS-CHECKS §2(e), checked there against a 2-D overlap integral.
 */
export function coaxialCoupling(q1Re: number, q1Im: number, q2Re: number, q2Im: number): number {
  const dRe = q1Re - q2Re
  const sIm = q1Im + q2Im
  // ≤ 1 in exact arithmetic; the clamp only removes rounding (1 + 2e-16).
  return Math.min(1, (4 * q1Im * q2Im) / (dRe * dRe + sIm * sIm))
}

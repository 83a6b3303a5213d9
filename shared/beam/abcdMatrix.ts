import type { Complex } from './complex'

/** A ray-transfer (ABCD) matrix [[a, b], [c, d]] with lengths in mm. */
export interface AbcdMatrix {
  a: number
  b: number
  c: number
  d: number
}

/** Free space of length d: [[1, d], [0, 1]] (Kogelnik & Li, Appl. Opt. 5, 1550 (1966)). */
export const freeSpaceMatrix = (distanceMm: number): AbcdMatrix => ({ a: 1, b: distanceMm, c: 0, d: 1 })

/** Thin lens of focal length f: [[1, 0], [−1/f, 1]] (Kogelnik & Li, Appl. Opt. 5, 1550 (1966)). */
export const thinLensMatrix = (focalLengthMm: number): AbcdMatrix => ({ a: 1, b: 0, c: -1 / focalLengthMm, d: 1 })

/** The matrix of elements met in the order given (the first element acts first). */
export function composeMatrices(...inPathOrder: AbcdMatrix[]): AbcdMatrix {
  let m: AbcdMatrix = { a: 1, b: 0, c: 0, d: 1 }
  for (const next of inPathOrder) {
    m = {
      a: next.a * m.a + next.b * m.c,
      b: next.a * m.b + next.b * m.d,
      c: next.c * m.a + next.d * m.c,
      d: next.c * m.b + next.d * m.d,
    }
  }
  return m
}

/**
 * ABCD law for the Gaussian beam parameter: q2 = (A q1 + B) / (C q1 + D).
 * Source: Kogelnik & Li, Appl. Opt. 5, 1550 (1966); Siegman, "Lasers" (1986), ch. 20.
 */
export function applyAbcd(q: Complex, m: AbcdMatrix): Complex {
  const nr = m.a * q.re + m.b
  const ni = m.a * q.im
  const dr = m.c * q.re + m.d
  const di = m.c * q.im
  const den = dr * dr + di * di
  return { re: (nr * dr + ni * di) / den, im: (ni * dr - nr * di) / den }
}

/** Inverse of a matrix (for tracing a target mode backwards). */
export function invertMatrix(m: AbcdMatrix): AbcdMatrix {
  const det = m.a * m.d - m.b * m.c
  return { a: m.d / det, b: -m.b / det, c: -m.c / det, d: m.a / det }
}

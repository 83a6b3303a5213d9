import { EngineError } from '../errors'

/**
 * Throws `unstable_cavity` unless 0 < g1·g2 < 1, the condition for a confined Gaussian eigenmode
 * (Kogelnik & Li, Appl. Opt. 5, 1550 (1966)). The edges (planar–planar, concentric, g1·g2 = 0 with
 * g1 ≠ g2 such as flat + confocal-radius) have no finite waist and are refused too; the symmetric confocal
 * cavity (g1 = g2 = 0) is the one edge case with a finite, well-defined waist and is allowed.
 */
export function assertStable(g1: number, g2: number): void {
  const product = g1 * g2
  const symmetricConfocal = g1 === 0 && g2 === 0
  const inside = product > 0 && product < 1
  if (!inside && !symmetricConfocal) {
    const reason =
      product > 1 || product < 0
        ? 'g1·g2 must lie between 0 and 1 for a stable cavity'
        : 'g1·g2 sits exactly on the stability edge, where the eigenmode waist is undefined'
    throw new EngineError(
      'unstable_cavity',
      `The cavity is unstable: g1 = ${fmt(g1)}, g2 = ${fmt(g2)}, g1·g2 = ${fmt(product)}; ${reason}. Check the mirror radii and the length.`,
      { g1, g2, product },
    )
  }
}

function fmt(value: number): string {
  return Number(value.toPrecision(6)).toString()
}

import { assertFiniteNumber } from './assertions'
import { assertStable } from './assertStable'

/**
 * One-way Gouy phase ψ between the mirrors of a stable two-mirror cavity, 0 < ψ < π:
 * ψ = arccos(+√(g1 g2)) when g1, g2 ≥ 0 and arccos(−√(g1 g2)) when both are negative, so that
 * near-concentric cavities (ψ > π/2) are not mirrored onto near-planar ones.
 * Source: Kogelnik & Li, Appl. Opt. 5, 1550 (1966); sign rule as in K. Arai, LIGO-T1300189 (2013), Eqs. (1)–(5).
 */
export function gouyPhaseOneWay(g1: number, g2: number): number {
  assertFiniteNumber(g1, 'g1')
  assertFiniteNumber(g2, 'g2')
  assertStable(g1, g2)
  const root = Math.sqrt(g1 * g2)
  return Math.acos(g1 < 0 ? -root : root)
}

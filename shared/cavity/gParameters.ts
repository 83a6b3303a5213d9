import { EngineError } from '../errors'
import { assertFiniteNumber, assertPositive } from './assertions'

export interface GParameters {
  g1: number
  g2: number
}

/**
 * Resonator g-parameters g_i = 1 − L/R_i of a linear two-mirror cavity; a flat mirror (null radius) has g = 1.
 * Source: Kogelnik & Li, Appl. Opt. 5, 1550 (1966); Siegman, "Lasers" (1986), ch. 19.
 * Radii are signed: positive = concave towards the cavity, negative = convex.
 */
export function gParameters(lengthM: number, roc1M: number | null, roc2M: number | null): GParameters {
  assertPositive(lengthM, 'lengthM')
  return { g1: gOf(lengthM, roc1M, 'roc1M'), g2: gOf(lengthM, roc2M, 'roc2M') }
}

function gOf(lengthM: number, rocM: number | null, name: string): number {
  if (rocM === null) return 1
  assertFiniteNumber(rocM, name)
  if (rocM === 0) throw new EngineError('invalid_argument', `${name} must not be 0 (use null for a flat mirror)`)
  return 1 - lengthM / rocM
}

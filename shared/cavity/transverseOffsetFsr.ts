import { EngineError } from '../errors'
import { assertFiniteNumber } from './assertions'

/** Offsets closer than this to a whole FSR fold to 0, so that exact degeneracies (confocal N = 2) do not read 0.99999…. */
const FOLD_TOLERANCE = 1e-9

/**
 * Frequency offset of transverse order N = n + m above its TEM00 resonance, in FSR units folded into [0, 1):
 * N·ψ/π mod 1, with ψ the one-way Gouy phase.
 * Source: Kogelnik & Li, Appl. Opt. 5, 1550 (1966); Siegman, "Lasers" (1986), ch. 19.
 */
export function transverseOffsetFsr(order: number, gouyOneWayRad: number): number {
  if (!Number.isInteger(order) || order < 0) {
    throw new EngineError('invalid_argument', `order must be a non-negative integer, got ${String(order)}`)
  }
  assertFiniteNumber(gouyOneWayRad, 'gouyOneWayRad')
  const raw = (order * gouyOneWayRad) / Math.PI
  let folded = raw - Math.floor(raw)
  if (folded < FOLD_TOLERANCE || 1 - folded < FOLD_TOLERANCE) folded = 0
  return folded
}

import { assertLenses, assertMatchingPath } from './assertions'
import { beamParameterAt } from './beamParameterAt'
import { coaxialCoupling } from './coaxialCoupling'
import { propagateBeamParameter } from './propagateBeamParameter'
import type { MatchingPath, PlacedLens } from './types'

export interface PathCoupling {
  /** Power coupling into the target mode, 0–1 (x and y combined). */
  coupling: number
  /** Coupling a circular beam with this axis's parameters would reach (the 2-D value per axis). */
  x: number
  y: number
}

/**
 * Coupling of the path's beam, passed through `lenses`, into the target mode at the cavity entrance plane
 * (aligned beams; size and position mismatch only). Source: ABCD law, Kogelnik & Li, Appl. Opt. 5, 1550 (1966);
 * overlap as in `coaxialCoupling`.
 */
export function pathCoupling(path: MatchingPath, lenses: readonly PlacedLens[]): PathCoupling {
  assertMatchingPath(path)
  assertLenses(lenses)
  const { beam, target, cavityPlaneMm } = path
  const start = Math.min(0, ...lenses.map((l) => l.zMm)) - 1
  const tRe = -target.waistFromEntranceMm
  const tIm = target.rayleighRangeMm
  const one = (axis: typeof beam.x): number => {
    const q = propagateBeamParameter(beamParameterAt(axis, beam.wavelengthNm, start), start, lenses, cavityPlaneMm)
    return coaxialCoupling(q.re, q.im, tRe, tIm)
  }
  const x = one(beam.x)
  const y = one(beam.y)
  return { coupling: Math.sqrt(x * y), x, y }
}

import { assertArgument, assertFiniteNumber, assertMatchingPath, assertNonNegative, assertPositive } from './assertions'
import { twoLensCoupling } from './twoLensCoupling'
import type { MatchingPath } from './types'

export interface MapLens {
  focalLengthMm: number
  id?: string
}

export interface CouplingMapRanges {
  /** Positions of lens A to scan, [from, to] in mm. */
  aMm: [number, number]
  /** Positions of lens B to scan, [from, to] in mm. */
  bMm: [number, number]
}

export interface CouplingMapOptions {
  /** Cells where the two lenses stand closer than this are NaN (they cannot both be mounted). @default 0 */
  minSpacingMm?: number
}

export interface CouplingMap {
  aZMm: Float64Array
  bZMm: Float64Array
  /** Row-major grid: coupling[i * bZMm.length + j] for lens A at aZMm[i] and lens B at bZMm[j]; NaN where not mountable. */
  coupling: Float64Array
  best: { aZMm: number; bZMm: number; coupling: number }
}

/**
 * The coupling into the target mode over the positions of two lenses (a 2-D grid, either lens may stand first), so a
 * user sees how forgiving a solution is. Source: ABCD law, Kogelnik & Li, Appl. Opt. 5, 1550 (1966); overlap as in
 * `coaxialCoupling`.
 */
export function couplingMap(
  path: MatchingPath,
  lensA: MapLens,
  lensB: MapLens,
  ranges: CouplingMapRanges,
  stepMm = 1,
  options: CouplingMapOptions = {},
): CouplingMap {
  const { minSpacingMm = 0 } = options
  assertMatchingPath(path)
  assertPositive(stepMm, 'stepMm')
  assertNonNegative(minSpacingMm, 'minSpacingMm')
  for (const lens of [lensA, lensB]) {
    assertFiniteNumber(lens?.focalLengthMm, 'focalLengthMm')
    assertArgument(lens.focalLengthMm !== 0, 'focalLengthMm must not be 0')
  }
  const axisOf = (range: [number, number], name: string): Float64Array => {
    assertArgument(Array.isArray(range) && range.length === 2, `${name} must be [from, to] in mm`)
    assertFiniteNumber(range[0], `${name}[0]`)
    assertFiniteNumber(range[1], `${name}[1]`)
    assertArgument(range[1] >= range[0], `${name} must run from a smaller to a larger position`)
    const count = Math.floor((range[1] - range[0]) / stepMm + 1e-9) + 1
    assertArgument(count <= 5000, `${name} with stepMm = ${stepMm} gives ${count} positions; use at most 5000 per axis`, 'grid_too_fine')
    return Float64Array.from({ length: count }, (_, i) => range[0] + i * stepMm)
  }
  const aZMm = axisOf(ranges?.aMm, 'ranges.aMm')
  const bZMm = axisOf(ranges?.bMm, 'ranges.bMm')
  const coupling = new Float64Array(aZMm.length * bZMm.length)
  const powerA = 1 / lensA.focalLengthMm
  const powerB = 1 / lensB.focalLengthMm
  const best = { aZMm: NaN, bZMm: NaN, coupling: -1 }
  for (let i = 0; i < aZMm.length; i++) {
    for (let j = 0; j < bZMm.length; j++) {
      const k = i * bZMm.length + j
      if (Math.abs(aZMm[i] - bZMm[j]) < minSpacingMm) {
        coupling[k] = NaN
        continue
      }
      const value = twoLensCoupling(path, powerA, aZMm[i], powerB, bZMm[j])
      coupling[k] = value
      if (value > best.coupling) {
        best.aZMm = aZMm[i]
        best.bZMm = bZMm[j]
        best.coupling = value
      }
    }
  }
  return { aZMm, bZMm, coupling, best }
}

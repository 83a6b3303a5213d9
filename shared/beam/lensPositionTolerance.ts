import { assertArgument, assertLenses, assertMatchingPath, assertPositive } from './assertions'
import { pathCoupling } from './pathCoupling'
import type { MatchingPath, PlacedLens } from './types'

export interface LensTolerance {
  id?: string
  zMm: number
  focalLengthMm: number
  /**
   * Coupling lost (fraction) when this lens alone moves by −step / +step; ≥ 0 at an optimum, negative when moving
   * that way would help (for instance past the edge of a lens zone, where the grid optimum sits).
   */
  lossMinus: number
  lossPlus: number
}

export interface ArrangementTolerance {
  stepMm: number
  coupling: number
  perLens: LensTolerance[]
  /** Lowest coupling when every lens is off by −step, 0 or +step (all combinations). */
  worstCoupling: number
}

/**
 * How much coupling an arrangement loses when each lens is misplaced by ±`stepMm` along the beam (mount tolerance):
 * per lens alone, and the worst case over all combinations. Source: ABCD law, Kogelnik & Li, Appl. Opt. 5, 1550
 * (1966); overlap as in `coaxialCoupling`.
 */
export function lensPositionTolerance(path: MatchingPath, lenses: readonly PlacedLens[], stepMm = 1): ArrangementTolerance {
  assertMatchingPath(path)
  assertLenses(lenses)
  assertPositive(stepMm, 'stepMm')
  assertArgument(lenses.length <= 6, 'lensPositionTolerance handles at most 6 lenses')
  const coupling = pathCoupling(path, lenses).coupling
  const moved = (shifts: number[]): number =>
    pathCoupling(path, lenses.map((l, i) => ({ ...l, zMm: l.zMm + shifts[i] * stepMm }))).coupling
  const perLens = lenses.map((lens, i) => {
    const shifts = (s: number) => lenses.map((_, k) => (k === i ? s : 0))
    return { id: lens.id, zMm: lens.zMm, focalLengthMm: lens.focalLengthMm, lossMinus: coupling - moved(shifts(-1)), lossPlus: coupling - moved(shifts(1)) }
  })
  let worstCoupling = coupling
  const combos = 3 ** lenses.length
  for (let code = 0; code < combos; code++) {
    const shifts: number[] = []
    let rest = code
    for (let i = 0; i < lenses.length; i++) {
      shifts.push((rest % 3) - 1)
      rest = Math.floor(rest / 3)
    }
    worstCoupling = Math.min(worstCoupling, moved(shifts))
  }
  return { stepMm, coupling, perLens, worstCoupling }
}

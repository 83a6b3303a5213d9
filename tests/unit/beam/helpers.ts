import { EngineError } from '../../../shared/errors'
import type { Beam } from '../../../shared/beam'

/** A circular pure-Gaussian beam (tiny factory for tests). Lengths in mm. */
export function circularBeam(waistRadiusMm: number, waistPositionMm: number, wavelengthNm = 1064, m2 = 1): Beam {
  const axis = { waistRadiusMm, waistPositionMm, m2 }
  return { wavelengthNm, x: { ...axis }, y: { ...axis } }
}

/** The EngineError thrown by `action` (fails the test when none is thrown). */
export function engineErrorOf(action: () => unknown): EngineError {
  try {
    action()
  } catch (error) {
    if (error instanceof EngineError) return error
    throw error
  }
  throw new Error('expected an EngineError')
}

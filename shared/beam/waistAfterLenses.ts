import { EngineError } from '../errors'
import { assertBeam, assertLenses } from './assertions'
import { axisAt } from './beamAt'
import type { Beam, BeamAxis, PlacedLens } from './types'

/**
 * The beam's waist after an optical system of thin lenses: per axis, waist radius, waist position on the path (mm
 * from the reference plane; before the last lens = a virtual waist) and M² (unchanged by lenses). With the result a
 * new `Beam` for the space after the last lens.
 * Source: ABCD law, Kogelnik & Li, Appl. Opt. 5, 1550 (1966); lens law cross-checked with Saleh & Teich,
 * "Fundamentals of Photonics" (1991), ch. 3.
 */
export function waistAfterLenses(beam: Beam, lenses: readonly PlacedLens[]): Beam {
  assertBeam(beam)
  assertLenses(lenses)
  if (lenses.length === 0) throw new EngineError('invalid_lens', 'waistAfterLenses needs at least one lens')
  const lastMm = Math.max(...lenses.map((l) => l.zMm))
  const image = (axis: BeamAxis): BeamAxis => {
    const state = axisAt(axis, beam.wavelengthNm, lenses, lastMm)
    return { waistRadiusMm: state.waistRadiusMm, waistPositionMm: lastMm + state.distanceToWaistMm, m2: axis.m2 }
  }
  return { wavelengthNm: beam.wavelengthNm, x: image(beam.x), y: image(beam.y) }
}

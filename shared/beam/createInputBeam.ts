import { EngineError, type EngineWarning } from '../errors'
import { assertBeam, assertWavelength } from './assertions'
import { fitBeamCaustic, type CausticFit } from './fitBeamCaustic'
import type { Beam } from './types'

/** A waist given directly, per axis (y defaults to x; M² defaults to 1). */
export interface WaistSpec {
  kind: 'waist'
  wavelengthNm: number
  x: { waistRadiusMm: number; waistPositionMm: number; m2?: number }
  y?: { waistRadiusMm: number; waistPositionMm: number; m2?: number }
}

/** Beam radii measured at several positions along the path, per axis (y defaults to x). */
export interface MeasuredSpec {
  kind: 'measured'
  wavelengthNm: number
  zMm: readonly number[]
  radiusXMm: readonly number[]
  radiusYMm?: readonly number[]
  /** Standard uncertainty of each radius, mm (one number or one per point); see `fitBeamCaustic`. */
  radiusUncertaintyMm?: number | readonly number[]
}

export type InputBeamSpec = WaistSpec | MeasuredSpec

export interface InputBeam {
  beam: Beam
  /** The ISO 11146-1 fits, per axis, when the beam came from measurements. */
  fits: { x: CausticFit; y: CausticFit } | null
  warnings: EngineWarning[]
}

/**
 * The laser's beam on the path, from a waist entered directly or from measured radii fitted per axis with the
 * ISO 11146-1 hyperbola (see `fitBeamCaustic`). Source: ISO 11146-1:2005; Siegman, "Lasers" (1986), ch. 17.
 */
export function createInputBeam(spec: InputBeamSpec): InputBeam {
  if (typeof spec !== 'object' || spec === null) throw new EngineError('invalid_beam', 'The input beam must be an object with kind "waist" or "measured"')
  assertWavelength(spec.wavelengthNm)
  if (spec.kind === 'waist') {
    const axis = (a: WaistSpec['x']) => ({ waistRadiusMm: a?.waistRadiusMm, waistPositionMm: a?.waistPositionMm, m2: a?.m2 ?? 1 })
    const beam: Beam = { wavelengthNm: spec.wavelengthNm, x: axis(spec.x), y: axis(spec.y ?? spec.x) }
    assertBeam(beam)
    const warnings: EngineWarning[] = []
    if (beam.x.m2 < 1 || beam.y.m2 < 1) warnings.push({ code: 'm2_below_one', message: 'M² below 1 is not possible for a real beam; check the value.' })
    return { beam, fits: null, warnings }
  }
  if (spec.kind !== 'measured') throw new EngineError('invalid_beam', 'The input beam kind must be "waist" or "measured"')
  const fitAxis = (radiusMm: readonly number[]) =>
    fitBeamCaustic({ wavelengthNm: spec.wavelengthNm, zMm: spec.zMm, radiusMm, radiusUncertaintyMm: spec.radiusUncertaintyMm })
  const x = fitAxis(spec.radiusXMm)
  const y = spec.radiusYMm === undefined ? x : fitAxis(spec.radiusYMm)
  const toAxis = (f: CausticFit) => ({ waistRadiusMm: f.waistRadiusMm, waistPositionMm: f.waistPositionMm, m2: f.m2 })
  const beam: Beam = { wavelengthNm: spec.wavelengthNm, x: toAxis(x), y: toAxis(y) }
  const warnings = [
    ...x.warnings.map((w) => ({ code: w.code, message: `x axis: ${w.message}` })),
    ...(spec.radiusYMm === undefined ? [] : y.warnings.map((w) => ({ code: w.code, message: `y axis: ${w.message}` }))),
  ]
  return { beam, fits: { x, y }, warnings }
}

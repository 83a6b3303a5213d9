import { EngineError } from '../errors'
import { assertFiniteNumber, assertPositive } from '../cavity/assertions'
import type { Beam, BeamAxis, MatchingPath, PlacedLens } from './types'

export { assertFiniteNumber, assertPositive }

/** Throws `invalid_argument` unless `value` is a finite number ≥ 0. */
export function assertNonNegative(value: unknown, name: string): asserts value is number {
  assertFiniteNumber(value, name)
  if (value < 0) throw new EngineError('invalid_argument', `${name} must not be negative, got ${value}`)
}

/** Throws `code` (default `invalid_argument`) with `message` unless `condition` holds. */
export function assertArgument(condition: boolean, message: string, code = 'invalid_argument'): asserts condition {
  if (!condition) throw new EngineError(code, message)
}

/** Throws `invalid_beam` unless the axis has a positive waist, a finite waist position and M² ≥ 1 … finite. */
export function assertBeamAxis(axis: BeamAxis, name: string): void {
  const ok = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v)
  if (typeof axis !== 'object' || axis === null) throw new EngineError('invalid_beam', `${name} must be an object with waistRadiusMm, waistPositionMm and m2`)
  if (!ok(axis.waistRadiusMm) || axis.waistRadiusMm <= 0) {
    throw new EngineError('invalid_beam', `${name}.waistRadiusMm must be a positive number of millimetres, got ${String(axis.waistRadiusMm)}`)
  }
  if (axis.waistRadiusMm > 100) {
    throw new EngineError('invalid_beam', `${name}.waistRadiusMm is ${axis.waistRadiusMm} mm; a waist over 100 mm is not a table-top beam (is it in micrometres?)`)
  }
  if (!ok(axis.waistPositionMm)) throw new EngineError('invalid_beam', `${name}.waistPositionMm must be a finite number of millimetres, got ${String(axis.waistPositionMm)}`)
  if (!ok(axis.m2) || axis.m2 <= 0) throw new EngineError('invalid_beam', `${name}.m2 must be a positive number (1 for a pure Gaussian), got ${String(axis.m2)}`)
}

/** Throws `invalid_beam` unless the beam has a sensible wavelength and two valid axes. */
export function assertBeam(beam: Beam): void {
  if (typeof beam !== 'object' || beam === null) throw new EngineError('invalid_beam', 'The beam must be an object with wavelengthNm, x and y')
  assertWavelength(beam.wavelengthNm)
  assertBeamAxis(beam.x, 'beam.x')
  assertBeamAxis(beam.y, 'beam.y')
}

/** Throws `invalid_argument` unless the wavelength is a plausible laser wavelength in nanometres. */
export function assertWavelength(wavelengthNm: unknown): asserts wavelengthNm is number {
  assertFiniteNumber(wavelengthNm, 'wavelengthNm')
  if (wavelengthNm < 100 || wavelengthNm > 20000) {
    throw new EngineError('invalid_argument', `wavelengthNm must be between 100 and 20000 nm, got ${wavelengthNm} (is it in metres or micrometres?)`)
  }
}

/** Throws `invalid_lens` unless every lens has a finite position and a finite, non-zero focal length. */
export function assertLenses(lenses: readonly PlacedLens[]): void {
  if (!Array.isArray(lenses)) throw new EngineError('invalid_lens', 'lenses must be an array of { zMm, focalLengthMm }')
  lenses.forEach((lens, i) => {
    if (typeof lens?.zMm !== 'number' || !Number.isFinite(lens.zMm)) {
      throw new EngineError('invalid_lens', `lenses[${i}].zMm must be a finite number of millimetres, got ${String(lens?.zMm)}`)
    }
    if (typeof lens.focalLengthMm !== 'number' || !Number.isFinite(lens.focalLengthMm) || lens.focalLengthMm === 0) {
      throw new EngineError('invalid_lens', `lenses[${i}].focalLengthMm must be a finite, non-zero number of millimetres, got ${String(lens.focalLengthMm)}`)
    }
  })
}

/** Throws `invalid_argument` unless the path has a valid beam, a target mode of the same wavelength and a finite cavity plane. */
export function assertMatchingPath(path: MatchingPath): void {
  if (typeof path !== 'object' || path === null) throw new EngineError('invalid_argument', 'path must be an object with beam, target and cavityPlaneMm')
  assertBeam(path.beam)
  const target = path.target
  if (typeof target !== 'object' || target === null) throw new EngineError('invalid_argument', 'path.target must be a target mode (see cavityEigenmodeBeam)')
  assertPositive(target.waistRadiusMm, 'path.target.waistRadiusMm')
  assertPositive(target.rayleighRangeMm, 'path.target.rayleighRangeMm')
  assertFiniteNumber(target.waistFromEntranceMm, 'path.target.waistFromEntranceMm')
  assertFiniteNumber(path.cavityPlaneMm, 'path.cavityPlaneMm')
  if (Math.abs(target.wavelengthNm - path.beam.wavelengthNm) > 1e-6 * target.wavelengthNm) {
    throw new EngineError('wavelength_mismatch', `The beam is at ${path.beam.wavelengthNm} nm but the target mode at ${target.wavelengthNm} nm`)
  }
}

import { assertBeam, assertFiniteNumber, assertLenses } from './assertions'
import { beamParameterAt } from './beamParameterAt'
import { describeBeamParameter, type BeamState } from './describeBeamParameter'
import { propagateBeamParameter } from './propagateBeamParameter'
import type { Beam, BeamAxis, PlacedLens } from './types'

/** Both axes of a beam at one plane. */
export interface BeamAtPlane {
  zMm: number
  x: BeamState
  y: BeamState
}

/**
 * The beam at path position `zMm` after every lens standing at or before it: radius, wavefront curvature, waist
 * size and distance, per axis. Source: ABCD law, Kogelnik & Li, Appl. Opt. 5, 1550 (1966).
 */
export function beamAt(beam: Beam, lenses: readonly PlacedLens[], zMm: number): BeamAtPlane {
  assertBeam(beam)
  assertLenses(lenses)
  assertFiniteNumber(zMm, 'zMm')
  return { zMm, x: axisAt(beam.x, beam.wavelengthNm, lenses, zMm), y: axisAt(beam.y, beam.wavelengthNm, lenses, zMm) }
}

/** One axis at `zMm`; q is taken in free space just before the first element (the beam is defined there). */
export function axisAt(axis: BeamAxis, wavelengthNm: number, lenses: readonly PlacedLens[], zMm: number): BeamState {
  const start = Math.min(zMm, ...lenses.map((l) => l.zMm)) - 1
  const q = propagateBeamParameter(beamParameterAt(axis, wavelengthNm, start), start, lenses, zMm)
  return describeBeamParameter(q, wavelengthNm, axis.m2)
}

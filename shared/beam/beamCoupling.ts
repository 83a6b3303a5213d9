import { EngineError } from '../errors'
import { assertBeam, assertFiniteNumber } from './assertions'
import { beamParameterAt } from './beamParameterAt'
import { overlap1d } from './overlap1d'
import type { Beam } from './types'

export interface BeamCouplingOptions {
  /** Path position of the plane where offsets and tilts are given, mm. @default the first beam's x waist */
  atMm?: number
  /** Offset of beam B relative to beam A at that plane, mm. @default 0 */
  offsetXMm?: number
  /** @default 0 */
  offsetYMm?: number
  /** Tilt of beam B relative to beam A at that plane, rad. @default 0 */
  tiltXRad?: number
  /** @default 0 */
  tiltYRad?: number
}

export interface BeamCoupling {
  /** Fraction of beam B's power that lands in beam A's mode (TEM00 of A), 0–1. */
  coupling: number
  /** One-axis overlaps; coupling = x · y. */
  x: number
  y: number
}

/**
 * Power coupling between two beams on the same path (waist size, waist position, lateral offset and tilt, each axis
 * separately; total = product of the x and y one-dimensional overlaps). For M² > 1 the embedded Gaussians are
 * compared (same waist position and Rayleigh range, waist / M): the real beam's TEM00 share is lower.
 * Source: overlap integral of Gaussian fields (Kogelnik & Li, Appl. Opt. 5, 1550 (1966)); misalignment as in Joyce &
 * DeLoach, Appl. Opt. 23, 4187 (1984) and Anderson, Appl. Opt. 23, 2944 (1984) (both from memory).
 */
export function beamCoupling(beamA: Beam, beamB: Beam, options: BeamCouplingOptions = {}): BeamCoupling {
  assertBeam(beamA)
  assertBeam(beamB)
  if (Math.abs(beamA.wavelengthNm - beamB.wavelengthNm) > 1e-9 * beamA.wavelengthNm) {
    throw new EngineError('wavelength_mismatch', `The two beams have different wavelengths (${beamA.wavelengthNm} nm and ${beamB.wavelengthNm} nm); they do not couple`)
  }
  const { atMm = beamA.x.waistPositionMm, offsetXMm = 0, offsetYMm = 0, tiltXRad = 0, tiltYRad = 0 } = options
  for (const [value, name] of [[atMm, 'atMm'], [offsetXMm, 'offsetXMm'], [offsetYMm, 'offsetYMm'], [tiltXRad, 'tiltXRad'], [tiltYRad, 'tiltYRad']] as const) {
    assertFiniteNumber(value, name)
  }
  const lambda = beamA.wavelengthNm
  const x = overlap1d(beamParameterAt(beamA.x, lambda, atMm), beamParameterAt(beamB.x, lambda, atMm), lambda, { offsetMm: offsetXMm, tiltRad: tiltXRad })
  const y = overlap1d(beamParameterAt(beamA.y, lambda, atMm), beamParameterAt(beamB.y, lambda, atMm), lambda, { offsetMm: offsetYMm, tiltRad: tiltYRad })
  return { coupling: x * y, x, y }
}

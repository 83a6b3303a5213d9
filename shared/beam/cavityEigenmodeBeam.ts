import { computeCavityModel, type CavityGeometry, type CavityModel } from '../cavity'
import { assertPositive } from './assertions'
import { applyAbcd, composeMatrices, freeSpaceMatrix, invertMatrix, type AbcdMatrix } from './abcdMatrix'
import type { TargetMode } from './types'
import { wavelengthMm } from './wavelengthMm'

/** The input mirror's substrate, when it is not to be ignored: flat outer face, curved coated face inside. */
export interface InputSubstrate {
  thicknessMm: number
  refractiveIndex: number
}

export interface CavityEigenmodeBeamOptions {
  /**
   * Treat mirror 1's substrate as a thick plano-curved element (the beam enters the flat outer face, crosses the
   * glass and leaves through the curved coated face, which then acts as a diverging lens of focal length −R1/(n − 1)).
   * `null` ignores the substrate: a thin, nearly flat substrate shifts and resizes the apparent waist little
   * (common practice), and the entrance plane is then the coated face itself.
   * @default null
   */
  inputSubstrate?: InputSubstrate | null
}

/** The cavity eigenmode inside the cavity and as the beam must see it from outside. */
export interface CavityEigenmodeBeam extends TargetMode {
  /** Waist radius inside the cavity, mm. */
  insideWaistRadiusMm: number
  /** Inside waist position from mirror 1's coated face, mm (positive = towards mirror 2). */
  insideWaistFromMirror1Mm: number
  /** Cavity length, mm (for drawing the mode inside the cavity). */
  cavityLengthMm: number
  /** Thickness of the substrate between the entrance plane and the coated face, mm (0 when ignored). */
  substrateThicknessMm: number
  model: CavityModel
}

/**
 * The TEM00 eigenmode of a two-mirror cavity as a target beam, referenced to mirror 1 (the input mirror). With a
 * substrate given, the mode is traced back through the curved interface, the glass and the flat outer face, so the
 * target is the mode's apparent waist seen from the entrance plane (the outer face).
 * Source: eigenmode from Kogelnik & Li, Appl. Opt. 5, 1550 (1966); refraction matrices for a spherical interface
 * from Siegman, "Lasers" (1986), ch. 15 (ray matrices).
 */
export function cavityEigenmodeBeam(geometry: CavityGeometry, options: CavityEigenmodeBeamOptions = {}): CavityEigenmodeBeam {
  const { inputSubstrate = null } = options
  const model = computeCavityModel(geometry)
  const valid = model.geometry
  const insideWaistRadiusMm = model.waist.radiusM * 1e3
  const insideWaistFromMirror1Mm = model.waist.positionFromMirror1M * 1e3
  const insideRayleighMm = model.rayleighRangeM * 1e3
  let target = { re: -insideWaistFromMirror1Mm, im: insideRayleighMm }
  let substrateThicknessMm = 0
  if (inputSubstrate !== null) {
    assertPositive(inputSubstrate.thicknessMm, 'inputSubstrate.thicknessMm')
    assertPositive(inputSubstrate.refractiveIndex, 'inputSubstrate.refractiveIndex')
    substrateThicknessMm = inputSubstrate.thicknessMm
    target = applyAbcd(target, invertMatrix(substrateMatrix(inputSubstrate, valid.roc1Mm)))
  }
  const rayleighRangeMm = target.im
  return {
    wavelengthNm: valid.wavelengthNm,
    waistRadiusMm: Math.sqrt((wavelengthMm(valid.wavelengthNm) * rayleighRangeMm) / Math.PI),
    waistFromEntranceMm: -target.re,
    rayleighRangeMm,
    insideWaistRadiusMm,
    insideWaistFromMirror1Mm,
    cavityLengthMm: valid.lengthMm,
    substrateThicknessMm,
    model,
  }
}

/**
 * Outer face (air → glass, flat), glass of thickness t, coated face (glass → air, radius R1 with its centre of
 * curvature inside the cavity: C = (n − 1)/R1, D = n). Siegman, "Lasers" (1986), ch. 15.
 */
function substrateMatrix(substrate: InputSubstrate, roc1Mm: number | null): AbcdMatrix {
  const n = substrate.refractiveIndex
  const flatIn: AbcdMatrix = { a: 1, b: 0, c: 0, d: 1 / n }
  const curvedOut: AbcdMatrix = { a: 1, b: 0, c: roc1Mm === null ? 0 : (n - 1) / roc1Mm, d: n }
  return composeMatrices(flatIn, freeSpaceMatrix(substrate.thicknessMm), curvedOut)
}

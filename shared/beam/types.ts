import type { EngineWarning } from '../errors'

/**
 * One transverse axis of a beam along the path. Positions are in millimetres along the beam from the path's
 * reference plane (z = 0, e.g. the laser's output face); the waist may lie before it (negative) or beyond.
 */
export interface BeamAxis {
  /** 1/e² intensity radius of the (real) beam at its waist, mm. */
  waistRadiusMm: number
  /** Waist position along the path, mm from the reference plane. */
  waistPositionMm: number
  /** Beam-quality factor M² (ISO 11146); 1 for a pure Gaussian. */
  m2: number
}

/** A beam with separate x and y axes (simple astigmatism: principal axes aligned with the table). */
export interface Beam {
  wavelengthNm: number
  x: BeamAxis
  y: BeamAxis
}

/** A thin lens standing on the path. */
export interface PlacedLens {
  /** Position along the path, mm from the reference plane. */
  zMm: number
  /** Focal length, mm; negative for a diverging lens. */
  focalLengthMm: number
  /** Kit identifier, when the lens comes from a kit. */
  id?: string
}

/** One entry of a lab's lens kit. Extra fields (type, wavelength range, notes) are carried through untouched. */
export interface KitLens {
  id: string
  focalLengthMm: number
  /** How many of this lens the kit holds; a lens is used twice only when count ≥ 2. */
  count: number
  [extra: string]: unknown
}

/** The Gaussian mode a beam must be matched into, as seen from outside the cavity. */
export interface TargetMode {
  wavelengthNm: number
  /** Waist radius of the mode (the cavity eigenmode, or its image through the input substrate), mm. */
  waistRadiusMm: number
  /** Waist position relative to the cavity's entrance plane (mirror 1), mm; positive = beyond it, into the cavity. */
  waistFromEntranceMm: number
  /** Rayleigh range, mm. */
  rayleighRangeMm: number
}

/**
 * A beam travelling towards a target mode whose entrance plane stands at `cavityPlaneMm` on the same path:
 * everything the coupling of an arrangement of lenses depends on.
 */
export interface MatchingPath {
  beam: Beam
  target: TargetMode
  /** Position of the cavity entrance plane (mirror 1) on the path, mm from the reference plane. */
  cavityPlaneMm: number
}

export type { EngineWarning }

import { z } from 'zod'

/**
 * Geometry of a linear two-mirror cavity, as typed by a person or sent by a script.
 * Lengths in millimetres, wavelength in nanometres; `null` radius = flat mirror;
 * a negative radius is a convex mirror (common practice sign convention).
 */
export const cavityGeometrySchema = z.object({
  /** Vacuum wavelength of the laser, nm. */
  wavelengthNm: z
    .number({ error: 'wavelengthNm must be a number (nanometres)' })
    .finite('wavelengthNm must be finite')
    .min(100, 'wavelengthNm must be at least 100 nm (is it in metres or micrometres?)')
    .max(20000, 'wavelengthNm must be at most 20000 nm (is it in picometres?)'),
  /** Mirror separation, mm. */
  lengthMm: z
    .number({ error: 'lengthMm must be a number (millimetres)' })
    .finite('lengthMm must be finite')
    .min(0.01, 'lengthMm must be at least 0.01 mm (is it in metres?)')
    .max(100000, 'lengthMm must be at most 100000 mm (100 m; is it in micrometres?)'),
  /** Radius of curvature of mirror 1, mm; null = flat; negative = convex. */
  roc1Mm: z
    .number({ error: 'roc1Mm must be a number (millimetres) or null for a flat mirror' })
    .finite('roc1Mm must be finite (use null for a flat mirror)')
    .refine((r) => Math.abs(r) >= 0.1, 'roc1Mm must satisfy |roc1Mm| >= 0.1 mm (use null for a flat mirror)')
    .nullable(),
  /** Radius of curvature of mirror 2, mm; null = flat; negative = convex. */
  roc2Mm: z
    .number({ error: 'roc2Mm must be a number (millimetres) or null for a flat mirror' })
    .finite('roc2Mm must be finite (use null for a flat mirror)')
    .refine((r) => Math.abs(r) >= 0.1, 'roc2Mm must satisfy |roc2Mm| >= 0.1 mm (use null for a flat mirror)')
    .nullable(),
  /** Power reflectivity of mirror 1, strictly between 0 and 1. */
  reflectivity1: z
    .number({ error: 'reflectivity1 must be a number (power reflectivity between 0 and 1)' })
    .gt(0, 'reflectivity1 must be greater than 0 (a power reflectivity, not percent)')
    .lt(1, 'reflectivity1 must be less than 1 (a power reflectivity, not percent)')
    .optional(),
  /** Power reflectivity of mirror 2, strictly between 0 and 1. */
  reflectivity2: z
    .number({ error: 'reflectivity2 must be a number (power reflectivity between 0 and 1)' })
    .gt(0, 'reflectivity2 must be greater than 0 (a power reflectivity, not percent)')
    .lt(1, 'reflectivity2 must be less than 1 (a power reflectivity, not percent)')
    .optional(),
  /** Phase-modulation frequency for sideband labelling, MHz. */
  modulationMHz: z.number({ error: 'modulationMHz must be a number (megahertz)' }).positive('modulationMHz must be positive').optional(),
})

export type CavityGeometry = z.infer<typeof cavityGeometrySchema>

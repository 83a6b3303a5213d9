/**
 * Payloads of the cavity, trace and analysis API, shared by server validation and client forms.
 */
import { z } from 'zod'
import { cavityGeometrySchema } from '../cavity/geometrySchema'

/** Cavity as created or edited by a lead: geometry plus the lab's own descriptions and target. */
export const cavityInputSchema = cavityGeometrySchema.extend({
  name: z.string().trim().min(1, 'name must not be empty').max(120, 'name must be at most 120 characters'),
  description: z.string().trim().max(2000, 'description must be at most 2000 characters').default(''),
  location: z.string().trim().max(200, 'location must be at most 200 characters').default(''),
  /** Target TEM00 fraction (0–1), e.g. 0.9; null = no target. */
  targetFundamentalFraction: z.number().gt(0, 'targetFundamentalFraction must be above 0').max(1, 'targetFundamentalFraction must be at most 1 (a fraction, not percent)').nullable().default(null),
  archived: z.boolean().default(false),
})
export type CavityInput = z.infer<typeof cavityInputSchema>

/** Partial edit: any subset of the fields. */
export const cavityPatchSchema = cavityInputSchema.partial()
export type CavityPatch = z.infer<typeof cavityPatchSchema>

/** A stored cavity as the API returns it. */
export interface Cavity extends CavityInput {
  id: string
  /** Sample interval last given for this cavity's one-column exports (s); used when an export states none. */
  sampleIntervalSeconds: number | null
  /** Proposed by an experimenter and not yet approved by a lead or an admin: out of the lists, no uploads. */
  pending: boolean
  /** Who proposed it (null when a lead or an admin created it). */
  proposedBy: number | null
  createdAt: string
  updatedAt: string
}

/** A sample interval in seconds: above 0, at most 1 s (a scope sweep samples far faster). */
export const sampleIntervalSchema = z
  .number({ error: 'sampleIntervalSeconds must be a number of seconds, e.g. 1e-5' })
  .gt(0, 'sampleIntervalSeconds must be above 0')
  .max(1, 'sampleIntervalSeconds must be at most 1 s (give it in seconds, not microseconds)')

/** Options for (re-)running an analysis; all optional. */
export const analysisOptionsSchema = z
  .object({
    transmissionChannel: z.union([z.string().min(1), z.number().int().min(0)]).optional(),
    rampChannel: z.union([z.string().min(1), z.number().int().min(0), z.null()]).optional(),
    sweepPart: z
      .object({ startTime: z.number().finite(), endTime: z.number().finite() })
      .refine((part) => part.endTime > part.startTime, 'sweepPart.endTime must be after sweepPart.startTime')
      .optional(),
    gouyOverrideRad: z.number().gt(0, 'gouyOverrideRad must be above 0').lt(Math.PI, 'gouyOverrideRad must be below π').optional(),
    peakModel: z.enum(['auto', 'lorentzian', 'airy']).optional(),
    modulationMHz: z.number().positive('modulationMHz must be positive').optional(),
    /**
     * Seconds between samples, for exports with no time column and no stated interval (one-column exports). A file
     * with its own time axis keeps it. Remembered per cavity as the default for later uploads.
     */
    sampleIntervalSeconds: sampleIntervalSchema.optional(),
    /** Which way the optical frequency runs during the sweep, when the lab knows it (settles a mirrored reading). */
    sweepDirection: z.enum(['up', 'down'], { message: "sweepDirection must be 'up' or 'down'" }).optional(),
  })
  .strict()
export type AnalysisOptions = z.infer<typeof analysisOptionsSchema>

export const analysisStatusSchema = z.enum(['queued', 'running', 'done', 'failed'])
export type AnalysisStatus = z.infer<typeof analysisStatusSchema>

/** Upload form fields besides the file(s). */
export const traceUploadFieldsSchema = z.object({
  note: z.string().trim().max(2000, 'note must be at most 2000 characters').default(''),
  /** Multipart fields are text: an empty field means none. */
  sampleIntervalSeconds: z.preprocess((value) => (value === '' || value === undefined ? undefined : Number(value)), sampleIntervalSchema.optional()),
})

/** Query of a cavity's history (`GET /api/cavities/:id/history` and its CSV). */
export const historyQuerySchema = z.object({
  from: z.coerce.date({ error: 'from must be a date (ISO 8601)' }).optional(),
  to: z.coerce.date({ error: 'to must be a date (ISO 8601)' }).optional(),
  limit: z.coerce.number().int().min(1).max(5000).optional(),
})

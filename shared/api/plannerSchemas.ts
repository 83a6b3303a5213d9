/**
 * Payloads of the lens-kit and mode-matching planner API (`/api/lenses`, `/api/cavities/:id/plan`,
 * `/api/cavities/:id/plans`, `/api/plans/:id`, `/api/analyses/:id/mismatch-family`), shared by server
 * validation and client forms. Lengths in mm, wavelengths in nm, couplings as fractions (0–1).
 */
import { z } from 'zod'
import type { CavityGeometry } from '../cavity'
import type { ArrangementTolerance, Beam, CausticFit, MismatchFamily } from '../beam'

/** Kinds of lens a kit lists. Cylindrical lenses act on one axis only, so the (spherical) planner leaves them out. */
export const lensTypes = ['plano-convex', 'bi-convex', 'plano-concave', 'bi-concave', 'meniscus', 'achromat', 'aspheric', 'cylindrical', 'other'] as const
export type LensType = (typeof lensTypes)[number]

const wavelengthBound = (name: string) =>
  z
    .number({ error: `${name} must be a number of nanometres or null` })
    .finite(`${name} must be finite`)
    .min(100, `${name} must be at least 100 nm (is it in micrometres?)`)
    .max(20000, `${name} must be at most 20000 nm`)
    .nullable()

const lensFields = {
  /** The lab's own short name for this lens (unique in the kit), e.g. "PCX-100a". */
  label: z.string({ error: 'label must be text' }).trim().min(1, 'label must not be empty').max(40, 'label must be at most 40 characters'),
  /** Focal length, mm; negative for a diverging lens. */
  focalLengthMm: z
    .number({ error: 'focalLengthMm must be a number of millimetres' })
    .finite('focalLengthMm must be finite')
    .refine((f) => Math.abs(f) >= 1, 'focalLengthMm must be at least 1 mm in size (negative for a diverging lens; is it in metres?)')
    .refine((f) => Math.abs(f) <= 100000, 'focalLengthMm must be at most 100000 mm in size (is it in micrometres?)'),
  /** How many of this lens the lab holds. */
  count: z.number({ error: 'count must be a whole number' }).int('count must be a whole number').min(0, 'count must be 0 or more').max(999, 'count must be at most 999'),
  type: z.enum(lensTypes, { error: `type must be one of ${lensTypes.join(', ')}` }),
  /** Design wavelength range of the coating, nm; null = not recorded (usable at any wavelength). */
  wavelengthMinNm: wavelengthBound('wavelengthMinNm'),
  wavelengthMaxNm: wavelengthBound('wavelengthMaxNm'),
  notes: z.string({ error: 'notes must be text' }).trim().max(1000, 'notes must be at most 1000 characters'),
}

const rangeInOrder = (lens: { wavelengthMinNm?: number | null; wavelengthMaxNm?: number | null }) =>
  lens.wavelengthMinNm == null || lens.wavelengthMaxNm == null || lens.wavelengthMinNm <= lens.wavelengthMaxNm

/** A new lens in the kit. */
export const lensInputSchema = z
  .object({
    label: lensFields.label,
    focalLengthMm: lensFields.focalLengthMm,
    count: lensFields.count.default(1),
    type: lensFields.type.default('plano-convex'),
    wavelengthMinNm: lensFields.wavelengthMinNm.default(null),
    wavelengthMaxNm: lensFields.wavelengthMaxNm.default(null),
    notes: lensFields.notes.default(''),
  })
  .strict()
  .refine(rangeInOrder, { message: 'wavelengthMinNm must not be larger than wavelengthMaxNm', path: ['wavelengthMinNm'] })
export type LensInput = z.infer<typeof lensInputSchema>

/** An edit: any of the fields. */
export const lensPatchSchema = z
  .object({
    label: lensFields.label.optional(),
    focalLengthMm: lensFields.focalLengthMm.optional(),
    count: lensFields.count.optional(),
    type: lensFields.type.optional(),
    wavelengthMinNm: lensFields.wavelengthMinNm.optional(),
    wavelengthMaxNm: lensFields.wavelengthMaxNm.optional(),
    notes: lensFields.notes.optional(),
  })
  .strict()
export type LensPatch = z.infer<typeof lensPatchSchema>

/** A lens of the kit as the API returns it. */
export interface Lens extends LensInput {
  id: string
  createdAt: string
  updatedAt: string
}

/** Columns of the kit's CSV, in order (export writes them; import needs label and focal_length_mm). */
export const lensCsvColumns = ['label', 'focal_length_mm', 'count', 'type', 'wavelength_min_nm', 'wavelength_max_nm', 'notes'] as const

/** Answer of `POST /api/lenses/import`. */
export interface LensImportResult {
  created: number
  updated: number
  lenses: Lens[]
}

const mm = (name: string) => z.number({ error: `${name} must be a number of millimetres` }).finite(`${name} must be finite`)
const positiveMm = (name: string) => mm(name).positive(`${name} must be a positive distance in mm`)
const nonNegativeMm = (name: string) => mm(name).min(0, `${name} must not be negative`)

const waistAxisSchema = z.object({
  waistRadiusMm: positiveMm('waistRadiusMm').max(1000, 'waistRadiusMm must be at most 1000 mm (is it in micrometres?)'),
  /** Along the path from the laser's reference plane; negative = before it (inside the laser). */
  waistPositionMm: mm('waistPositionMm'),
  m2: z.number({ error: 'm2 must be a number' }).finite().min(0.5, 'm2 must be at least 0.5 (a real beam has M² ≥ 1)').max(100, 'm2 must be at most 100').optional(),
})

/** The laser's beam: a waist per axis, or beam radii measured at several distances (fitted per axis, ISO 11146-1). */
export const plannerBeamSchema = z.discriminatedUnion(
  'kind',
  [
    z.object({ kind: z.literal('waist'), wavelengthNm: z.number().finite().positive().optional(), x: waistAxisSchema, y: waistAxisSchema.optional() }).strict(),
    z
      .object({
        kind: z.literal('measured'),
        wavelengthNm: z.number().finite().positive().optional(),
        zMm: z.array(mm('zMm[]')).min(4, 'zMm needs at least 4 positions for the hyperbolic fit').max(200, 'zMm may hold at most 200 positions'),
        radiusXMm: z.array(positiveMm('radiusXMm[]')).max(200),
        radiusYMm: z.array(positiveMm('radiusYMm[]')).max(200).optional(),
        radiusUncertaintyMm: z.union([positiveMm('radiusUncertaintyMm'), z.array(positiveMm('radiusUncertaintyMm[]')).max(200)]).optional(),
      })
      .strict()
      .refine((m) => m.radiusXMm.length === m.zMm.length, { message: 'radiusXMm must hold one radius per position in zMm', path: ['radiusXMm'] })
      .refine((m) => m.radiusYMm === undefined || m.radiusYMm.length === m.zMm.length, { message: 'radiusYMm must hold one radius per position in zMm', path: ['radiusYMm'] }),
  ],
  { error: 'beam.kind must be "waist" or "measured"' },
)
export type PlannerBeam = z.infer<typeof plannerBeamSchema>

/** Where lenses may stand between the laser (z = 0) and the cavity's entrance mirror. */
export const plannerTableSchema = z
  .object({
    laserToCavityMm: positiveMm('laserToCavityMm').max(20000, 'laserToCavityMm must be at most 20000 mm'),
    lensZonesMm: z
      .array(z.tuple([nonNegativeMm('lensZonesMm from'), nonNegativeMm('lensZonesMm to')], { error: 'each lens zone must be [from, to] in mm' }))
      .min(1, 'lensZonesMm must list at least one [from, to] zone where lenses may stand')
      .max(10, 'lensZonesMm may list at most 10 zones'),
    minSpacingMm: nonNegativeMm('minSpacingMm').default(0),
    positionStepMm: mm('positionStepMm').min(0.1, 'positionStepMm must be at least 0.1 mm').max(100, 'positionStepMm must be at most 100 mm').default(1),
  })
  .strict()
  .refine((t) => t.lensZonesMm.every(([from, to]) => to >= from), { message: 'every lens zone must run from a smaller to a larger distance', path: ['lensZonesMm'] })
export type PlannerTable = z.infer<typeof plannerTableSchema>

/** `POST /api/cavities/:id/plan`: a pure computation, nothing is stored. */
export const planRequestSchema = z
  .object({
    beam: plannerBeamSchema,
    table: plannerTableSchema,
    /** Coupling the lab wants. */
    couplingTarget: z.number({ error: 'couplingTarget must be a fraction' }).gt(0, 'couplingTarget must be above 0').max(1, 'couplingTarget must be at most 1 (a fraction, not percent)').default(0.95),
    rankBy: z.enum(['robust', 'coupling']).default('robust'),
    /** Mount tolerance used for the ± losses, mm. */
    toleranceMm: z.number().finite().positive('toleranceMm must be positive').max(20, 'toleranceMm must be at most 20 mm').default(1),
    /** Plan with these lenses of the kit only; absent = the whole kit. */
    lensIds: z.array(z.uuid({ error: 'lensIds must hold lens ids' })).max(500).optional(),
    /** Which arrangement the beam-path picture shows (index in the answer's arrangements). @default 0 */
    pathArrangement: z.number().int().min(0).max(49).optional(),
    /** Which two-lens arrangement the coupling map shows (index in the answer's arrangements); absent = the first two-lens one. */
    mapArrangement: z.number().int().min(0).max(49).optional(),
  })
  .strict()
export type PlanRequest = z.input<typeof planRequestSchema>
export type ParsedPlanRequest = z.infer<typeof planRequestSchema>

/** One lens of a saved plan: from the kit (`lensId`), or a free focal length (an ideal lens to buy). */
export const plannedLensSchema = z
  .object({
    lensId: z.uuid({ error: 'lensId must be a lens id' }).optional(),
    focalLengthMm: lensFields.focalLengthMm.optional(),
    zMm: nonNegativeMm('zMm'),
  })
  .strict()
  .refine((l) => (l.lensId === undefined) !== (l.focalLengthMm === undefined), 'each lens needs either lensId (from the kit) or focalLengthMm (a lens to buy), not both')

/** `POST /api/cavities/:id/plans`: save the chosen lenses with the inputs that led to them. */
export const planSaveSchema = z
  .object({
    inputs: planRequestSchema,
    lenses: z.array(plannedLensSchema).min(1, 'a plan needs at least one lens').max(3, 'a plan holds at most 3 lenses'),
    note: z.string().trim().max(4000, 'note must be at most 4000 characters').default(''),
  })
  .strict()
export type PlanSave = z.input<typeof planSaveSchema>

/** A lens placed on the path, with what the kit says of it. */
export interface PlacedKitLens {
  lensId: string | null
  label: string
  type: LensType | null
  focalLengthMm: number
  zMm: number
}

export interface PlanArrangement {
  kind: 'one-lens' | 'two-lens'
  lenses: PlacedKitLens[]
  coupling: number
  tolerance: ArrangementTolerance
}

/** Beam radius along the path through the lenses, and the cavity eigenmode inside the cavity. */
export interface BeamPathPicture {
  /** Index of the arrangement drawn (in the plan answer; 0 for a saved plan). */
  arrangementIndex: number
  lenses: PlacedKitLens[]
  zMm: number[]
  radiusXMm: number[]
  radiusYMm: number[]
  cavity: { fromMm: number; toMm: number; zMm: number[]; radiusMm: number[] }
}

/** Coupling over the positions of the two lenses of one arrangement; null cells cannot be mounted. */
export interface CouplingMapPicture {
  arrangementIndex: number
  lensA: PlacedKitLens
  lensB: PlacedKitLens
  aZMm: number[]
  bZMm: number[]
  /** Row-major: coupling[i * bZMm.length + j] for lens A at aZMm[i], lens B at bZMm[j]. */
  coupling: (number | null)[]
  best: { aZMm: number; bZMm: number; coupling: number }
}

/** A caustic fit as the answer carries it. */
export type BeamFitSummary = Pick<CausticFit, 'waistRadiusMm' | 'waistPositionMm' | 'm2' | 'rayleighRangeMm' | 'uncertainty' | 'residualsMm' | 'reducedChiSquare' | 'uncertaintySource'>

export interface PlanWarning {
  code: string
  message: string
}

/** Answer of `POST /api/cavities/:id/plan`. */
export interface PlanAnswer {
  cavity: { id: string; name: string; wavelengthNm: number }
  beam: Beam
  fits: { x: BeamFitSummary; y: BeamFitSummary } | null
  target: { waistRadiusMm: number; waistFromEntranceMm: number; rayleighRangeMm: number; insideWaistRadiusMm: number; insideWaistFromMirror1Mm: number }
  kit: { used: number; left: { label: string; reason: string }[] }
  arrangements: PlanArrangement[]
  ideal: {
    singleLens: { focalLengthMm: number; zMm: number; coupling: number } | null
    twoLens: { lenses: { focalLengthMm: number; zMm: number }[]; coupling: number; worstCoupling: number | null }[]
  }
  couplingTarget: number
  reachesTarget: boolean
  verdict: string
  evaluated: { oneLens: number; twoLens: number; positions: number }
  /** Null when the search was complete; otherwise a sentence saying that (and where) its time budget cut it. */
  cut: string | null
  warnings: PlanWarning[]
  pictures: { path: BeamPathPicture | null; map: CouplingMapPicture | null }
  computeMs: number
}

/** A saved plan (`GET /api/plans/:id`; lists carry the same without `pictures`). */
export interface SavedPlan {
  id: string
  cavityId: string
  cavityName: string
  author: { id: number; name: string } | null
  createdAt: string
  note: string
  inputs: ParsedPlanRequest
  beam: Beam
  geometry: CavityGeometry
  solution: { lenses: PlacedKitLens[]; coupling: number; tolerance: ArrangementTolerance }
  coupling: number
  pictures?: { path: BeamPathPicture; map: CouplingMapPicture | null }
}

/** Answer of `GET /api/analyses/:id/mismatch-family`. */
export interface MismatchFamilyAnswer {
  analysisId: string
  cavityId: string
  analysedAt: string
  /** Carrier power share in order 2 (the mismatch signature). */
  order2Share: number
  fundamentalFraction: number
  mode: { waistRadiusMm: number; rayleighRangeMm: number }
  family: MismatchFamily
  /** What moving each lens of the cavity's newest saved plan (or `?planId=`) does, for several mount steps. */
  plan: { id: string; createdAt: string; lenses: PlacedKitLens[]; coupling: number; steps: ArrangementTolerance[] } | null
  reading: string
}

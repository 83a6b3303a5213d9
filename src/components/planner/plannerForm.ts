/**
 * The planner's two forms (the laser's beam; where lenses may stand) as plain state, their starting values, and the
 * request they make. The forms speak the lab's units (waist radii in µm, distances in mm, the target in percent);
 * the request speaks the API's (mm, fractions). Checked with the shared schema before anything is sent.
 */
import { planRequestSchema, type PlanRequest } from '../../../shared/api/plannerSchemas'

export interface MeasuredRow {
  zMm: number | null
  radiusXUm: number | null
  radiusYUm: number | null
}

export interface BeamForm {
  kind: 'waist' | 'measured'
  waistXUm: number | null
  waistXPositionMm: number | null
  m2X: number | null
  /** The y axis has its own waist (an astigmatic or elliptical beam). */
  separateY: boolean
  waistYUm: number | null
  waistYPositionMm: number | null
  m2Y: number | null
  rows: MeasuredRow[]
  /** Uncertainty of each measured radius, µm; empty = estimated from the scatter. */
  uncertaintyUm: number | null
}

export interface TableForm {
  laserToCavityMm: number | null
  zones: { fromMm: number | null; toMm: number | null }[]
  minSpacingMm: number | null
  positionStepMm: number | null
  targetPercent: number | null
  rankBy: 'robust' | 'coupling'
}

export function defaultBeamForm(): BeamForm {
  return {
    kind: 'waist',
    waistXUm: null,
    waistXPositionMm: 0,
    m2X: 1,
    separateY: false,
    waistYUm: null,
    waistYPositionMm: 0,
    m2Y: 1,
    rows: Array.from({ length: 6 }, () => ({ zMm: null, radiusXUm: null, radiusYUm: null })),
    uncertaintyUm: null,
  }
}

export function defaultTableForm(): TableForm {
  return {
    laserToCavityMm: 700,
    zones: [
      { fromMm: 80, toMm: 300 },
      { fromMm: 350, toMm: 620 },
    ],
    minSpacingMm: 25,
    positionStepMm: 1,
    targetPercent: 95,
    rankBy: 'robust',
  }
}

const um = (value: number | null) => (value === null ? undefined : value / 1000)
const given = (value: number | null) => (value === null ? undefined : value)

function beamOf(form: BeamForm): Record<string, unknown> {
  if (form.kind === 'waist') {
    const axis = (waistUm: number | null, positionMm: number | null, m2: number | null) => ({ waistRadiusMm: um(waistUm), waistPositionMm: given(positionMm), m2: given(m2) })
    return {
      kind: 'waist',
      x: axis(form.waistXUm, form.waistXPositionMm, form.m2X),
      ...(form.separateY ? { y: axis(form.waistYUm, form.waistYPositionMm, form.m2Y) } : {}),
    }
  }
  const rows = form.rows.filter((row) => row.zMm !== null || row.radiusXUm !== null || row.radiusYUm !== null)
  return {
    kind: 'measured',
    zMm: rows.map((row) => row.zMm),
    radiusXMm: rows.map((row) => um(row.radiusXUm)),
    ...(form.separateY ? { radiusYMm: rows.map((row) => um(row.radiusYUm)) } : {}),
    ...(form.uncertaintyUm !== null ? { radiusUncertaintyMm: form.uncertaintyUm / 1000 } : {}),
  }
}

/** Field names as the form shows them, for messages. */
const fieldNames: Record<string, string> = {
  waistRadiusMm: 'waist radius',
  waistPositionMm: 'waist position',
  m2: 'M²',
  zMm: 'measurement positions',
  radiusXMm: 'x radii',
  radiusYMm: 'y radii',
  laserToCavityMm: 'laser to cavity',
  lensZonesMm: 'lens zones',
  minSpacingMm: 'minimum spacing',
  positionStepMm: 'position step',
  couplingTarget: 'coupling target',
}

/** The request the two forms make, or the problems in plain words (one per field). */
export function planRequestFromForms(beam: BeamForm, table: TableForm, extra: Partial<PlanRequest> = {}): { request: PlanRequest } | { errors: string[] } {
  const candidate = {
    beam: beamOf(beam),
    table: {
      laserToCavityMm: given(table.laserToCavityMm),
      lensZonesMm: table.zones.map((zone) => [given(zone.fromMm), given(zone.toMm)]),
      minSpacingMm: given(table.minSpacingMm),
      positionStepMm: given(table.positionStepMm),
    },
    couplingTarget: table.targetPercent === null ? undefined : table.targetPercent / 100,
    rankBy: table.rankBy,
    ...extra,
  }
  const parsed = planRequestSchema.safeParse(candidate)
  if (parsed.success) return { request: candidate as PlanRequest }
  const errors = parsed.error.issues.map((issue) => {
    const named = [...issue.path].reverse().find((part) => typeof part === 'string' && part in fieldNames)
    const missing = issue.code === 'invalid_type' && issue.input === undefined
    const where = named ? fieldNames[named as string] : issue.path.join('.')
    return missing ? `Fill in the ${where}.` : `${where[0].toUpperCase()}${where.slice(1)}: ${issue.message}`
  })
  return { errors: [...new Set(errors)] }
}

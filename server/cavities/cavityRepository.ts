/** Data access for cavities: rows in, plain `Cavity` objects out. */
import type { Cavity, CavityInput, CavityPatch } from '../../shared/api/cavitySchemas'
import type { Db } from '../db/knex'

interface CavityRow {
  id: string
  name: string
  description: string
  location: string
  wavelength_nm: number
  length_mm: number
  roc1_mm: number | null
  roc2_mm: number | null
  reflectivity1: number | null
  reflectivity2: number | null
  modulation_mhz: number | null
  target_fundamental_fraction: number | null
  sample_interval_s: number | null
  pending: boolean
  proposed_by: number | null
  archived: boolean
  created_at: Date
  updated_at: Date
}

function toCavity(row: CavityRow): Cavity {
  return {
    id: row.id,
    name: row.name,
    description: row.description,
    location: row.location,
    wavelengthNm: row.wavelength_nm,
    lengthMm: row.length_mm,
    roc1Mm: row.roc1_mm,
    roc2Mm: row.roc2_mm,
    ...(row.reflectivity1 === null ? {} : { reflectivity1: row.reflectivity1 }),
    ...(row.reflectivity2 === null ? {} : { reflectivity2: row.reflectivity2 }),
    ...(row.modulation_mhz === null ? {} : { modulationMHz: row.modulation_mhz }),
    targetFundamentalFraction: row.target_fundamental_fraction,
    sampleIntervalSeconds: row.sample_interval_s,
    pending: row.pending,
    proposedBy: row.proposed_by,
    archived: row.archived,
    createdAt: row.created_at.toISOString(),
    updatedAt: row.updated_at.toISOString(),
  }
}

function toRow(input: CavityPatch): Partial<CavityRow> {
  const row: Partial<CavityRow> = {}
  const set = <K extends keyof CavityRow>(key: K, value: CavityRow[K] | undefined) => {
    if (value !== undefined) row[key] = value
  }
  set('name', input.name)
  set('description', input.description)
  set('location', input.location)
  set('wavelength_nm', input.wavelengthNm)
  set('length_mm', input.lengthMm)
  set('roc1_mm', input.roc1Mm)
  set('roc2_mm', input.roc2Mm)
  // Optional numbers: present in the input (even undefined-valued keys are skipped) → stored; explicit null clears.
  if ('reflectivity1' in input) row.reflectivity1 = input.reflectivity1 ?? null
  if ('reflectivity2' in input) row.reflectivity2 = input.reflectivity2 ?? null
  if ('modulationMHz' in input) row.modulation_mhz = input.modulationMHz ?? null
  set('target_fundamental_fraction', input.targetFundamentalFraction)
  set('archived', input.archived)
  return row
}

/** The lab's cavities by name; proposals waiting for approval only when asked for (`pending: true` lists only them). */
export async function listCavities(db: Db, options: { includeArchived?: boolean; pending?: boolean } = {}): Promise<Cavity[]> {
  const query = db<CavityRow>('cavities').orderBy('name').where({ pending: options.pending ?? false })
  if (!options.includeArchived) query.where({ archived: false })
  return (await query).map(toCavity)
}

export async function findCavity(db: Db, id: string): Promise<Cavity | null> {
  const row = await db<CavityRow>('cavities').where({ id }).first()
  return row ? toCavity(row) : null
}

export async function findCavityByName(db: Db, name: string): Promise<Cavity | null> {
  const row = await db<CavityRow>('cavities').where({ name }).first()
  return row ? toCavity(row) : null
}

/** Insert a cavity; `proposedBy` makes it a proposal waiting for approval. */
export async function insertCavity(db: Db, input: CavityInput, proposal: { proposedBy: number } | null = null): Promise<Cavity> {
  const [row] = await db<CavityRow>('cavities')
    .insert({ ...toRow(input), ...(proposal ? { pending: true, proposed_by: proposal.proposedBy } : {}) })
    .returning('*')
  return toCavity(row as CavityRow)
}

/** Approve a proposal; false when it is not one. */
export async function approveCavity(db: Db, id: string): Promise<boolean> {
  return (await db('cavities').where({ id, pending: true }).update({ pending: false, updated_at: db.fn.now() })) > 0
}

/** Remove a proposal that is turned down (it holds no traces: uploads wait for approval). */
export async function deleteProposal(db: Db, id: string): Promise<boolean> {
  return (await db('cavities').where({ id, pending: true }).delete()) > 0
}

/** Remember the sample interval last given for a cavity's one-column exports. */
export async function rememberSampleInterval(db: Db, id: string, seconds: number): Promise<void> {
  await db('cavities').where({ id }).update({ sample_interval_s: seconds })
}

export async function updateCavity(db: Db, id: string, patch: CavityPatch): Promise<Cavity | null> {
  const [row] = await db<CavityRow>('cavities')
    .where({ id })
    .update({ ...toRow(patch), updated_at: db.fn.now() as unknown as Date })
    .returning('*')
  return row ? toCavity(row as CavityRow) : null
}

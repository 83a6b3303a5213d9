/** Data access for the lab's lens kit: rows in, plain `Lens` objects out. */
import type { Knex } from 'knex'
import type { Lens, LensInput, LensPatch, LensType } from '../../shared/api/plannerSchemas'
import type { Db } from '../db/knex'

interface LensRow {
  id: string
  label: string
  focal_length_mm: number
  count: number
  type: LensType
  wavelength_min_nm: number | null
  wavelength_max_nm: number | null
  notes: string
  created_at: Date
  updated_at: Date
}

function toLens(row: LensRow): Lens {
  return {
    id: row.id,
    label: row.label,
    focalLengthMm: row.focal_length_mm,
    count: row.count,
    type: row.type,
    wavelengthMinNm: row.wavelength_min_nm,
    wavelengthMaxNm: row.wavelength_max_nm,
    notes: row.notes,
    createdAt: row.created_at.toISOString(),
    updatedAt: row.updated_at.toISOString(),
  }
}

function toRow(input: LensPatch): Partial<LensRow> {
  const row: Partial<LensRow> = {}
  if (input.label !== undefined) row.label = input.label
  if (input.focalLengthMm !== undefined) row.focal_length_mm = input.focalLengthMm
  if (input.count !== undefined) row.count = input.count
  if (input.type !== undefined) row.type = input.type
  if (input.wavelengthMinNm !== undefined) row.wavelength_min_nm = input.wavelengthMinNm
  if (input.wavelengthMaxNm !== undefined) row.wavelength_max_nm = input.wavelengthMaxNm
  if (input.notes !== undefined) row.notes = input.notes
  return row
}

/** The kit, shortest focal length first (diverging lenses before converging ones), then by label. */
export async function listLenses(db: Db | Knex.Transaction): Promise<Lens[]> {
  return ((await db<LensRow>('lenses').orderBy([{ column: 'focal_length_mm' }, { column: 'label' }])) as LensRow[]).map(toLens)
}

export async function findLens(db: Db, id: string): Promise<Lens | null> {
  const row = await db<LensRow>('lenses').where({ id }).first()
  return row ? toLens(row as LensRow) : null
}

export async function insertLens(db: Db | Knex.Transaction, input: LensInput): Promise<Lens> {
  const [row] = await db<LensRow>('lenses').insert(toRow(input)).returning('*')
  return toLens(row as LensRow)
}

export async function updateLens(db: Db | Knex.Transaction, id: string, patch: LensPatch): Promise<Lens | null> {
  const [row] = await db<LensRow>('lenses')
    .where({ id })
    .update({ ...toRow(patch), updated_at: db.fn.now() as unknown as Date })
    .returning('*')
  return row ? toLens(row as LensRow) : null
}

export async function deleteLens(db: Db, id: string): Promise<boolean> {
  return (await db('lenses').where({ id }).delete()) > 0
}

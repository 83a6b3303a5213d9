/** Lens-kit use cases: list, add, edit, remove, and the CSV import (all or nothing) and export. */
import type { Lens, LensImportResult, LensInput, LensPatch } from '../../shared/api/plannerSchemas'
import type { Db } from '../db/knex'
import { HttpError } from '../http/errors'
import { formatLensCsv, parseLensCsv } from './lensCsv'
import { deleteLens, findLens, insertLens, listLenses, updateLens } from './lensRepository'

function isUniqueViolation(error: unknown): boolean {
  return (error as { code?: string }).code === '23505'
}

const labelTaken = (label: string | undefined) => new HttpError(409, 'label_taken', `The kit already has a lens labelled "${label}"; labels must be unique.`)

export async function getLens(db: Db, id: string): Promise<Lens> {
  const lens = await findLens(db, id)
  if (!lens) throw new HttpError(404, 'lens_not_found', `No lens with id ${id}.`)
  return lens
}

export async function addLens(db: Db, input: LensInput): Promise<Lens> {
  try {
    return await insertLens(db, input)
  } catch (error) {
    if (isUniqueViolation(error)) throw labelTaken(input.label)
    throw error
  }
}

export async function editLens(db: Db, id: string, patch: LensPatch): Promise<Lens> {
  const current = await getLens(db, id)
  const min = patch.wavelengthMinNm !== undefined ? patch.wavelengthMinNm : current.wavelengthMinNm
  const max = patch.wavelengthMaxNm !== undefined ? patch.wavelengthMaxNm : current.wavelengthMaxNm
  if (min != null && max != null && min > max) throw new HttpError(400, 'invalid_input', `wavelengthMinNm (${min} nm) must not be larger than wavelengthMaxNm (${max} nm).`)
  try {
    const lens = await updateLens(db, id, patch)
    if (!lens) throw new HttpError(404, 'lens_not_found', `No lens with id ${id}.`)
    return lens
  } catch (error) {
    if (isUniqueViolation(error)) throw labelTaken(patch.label)
    throw error
  }
}

export async function removeLens(db: Db, id: string): Promise<void> {
  if (!(await deleteLens(db, id))) throw new HttpError(404, 'lens_not_found', `No lens with id ${id}.`)
}

/**
 * Read a kit CSV and apply it in one transaction: a line whose label is already in the kit updates that lens,
 * any other line adds one. Any bad line refuses the whole file, naming every bad line.
 */
export async function importLensCsv(db: Db, text: string): Promise<LensImportResult> {
  const reading = parseLensCsv(text)
  if ('errors' in reading) {
    const shown = reading.errors.slice(0, 20)
    const more = reading.errors.length > shown.length ? `; and ${reading.errors.length - shown.length} more` : ''
    throw new HttpError(422, 'invalid_csv', `Nothing was imported. ${shown.join('; ')}${more}.`)
  }
  let created = 0
  let updated = 0
  const lenses = await db.transaction(async (trx) => {
    const byLabel = new Map((await listLenses(trx)).map((lens) => [lens.label, lens.id]))
    for (const { lens } of reading.lenses) {
      const id = byLabel.get(lens.label)
      if (id) {
        await updateLens(trx, id, lens)
        updated += 1
      } else {
        await insertLens(trx, lens)
        created += 1
      }
    }
    return listLenses(trx)
  })
  return { created, updated, lenses }
}

export async function exportLensCsv(db: Db): Promise<string> {
  return formatLensCsv(await listLenses(db))
}

export { listLenses }

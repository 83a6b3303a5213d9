/** Cavity use cases: create and edit with a stability check, read with the computed model. */
import { computeCavityModel, type CavityModel } from '../../shared/cavity'
import { cavityGeometrySchema } from '../../shared/cavity/geometrySchema'
import type { Cavity, CavityInput, CavityPatch } from '../../shared/api/cavitySchemas'
import type { Db } from '../db/knex'
import { HttpError } from '../http/errors'
import { findCavity, insertCavity, listCavities, updateCavity } from './cavityRepository'

/** The geometry part of a cavity, as the engine takes it. */
export function geometryOf(cavity: CavityInput | Cavity) {
  return cavityGeometrySchema.parse({
    wavelengthNm: cavity.wavelengthNm,
    lengthMm: cavity.lengthMm,
    roc1Mm: cavity.roc1Mm,
    roc2Mm: cavity.roc2Mm,
    reflectivity1: cavity.reflectivity1,
    reflectivity2: cavity.reflectivity2,
    modulationMHz: cavity.modulationMHz,
  })
}

function isUniqueViolation(error: unknown): boolean {
  return (error as { code?: string }).code === '23505'
}

/** Create a cavity; with `proposedBy` it is a proposal that a lead or an admin approves. */
export async function createCavity(db: Db, input: CavityInput, proposal: { proposedBy: number } | null = null): Promise<Cavity> {
  computeCavityModel(geometryOf(input)) // refuses an unstable geometry with a message naming it
  try {
    return await insertCavity(db, input, proposal)
  } catch (error) {
    if (isUniqueViolation(error)) throw new HttpError(409, 'name_taken', `A cavity named "${input.name}" already exists.`)
    throw error
  }
}

export async function getCavity(db: Db, id: string): Promise<Cavity> {
  const cavity = await findCavity(db, id)
  if (!cavity) throw new HttpError(404, 'cavity_not_found', `No cavity with id ${id}.`)
  return cavity
}

/** A cavity with its computed card (FSR, g-parameters, Gouy phase, eigenmode, design finesse). */
export async function getCavityWithModel(db: Db, id: string): Promise<{ cavity: Cavity; model: CavityModel }> {
  const cavity = await getCavity(db, id)
  return { cavity, model: computeCavityModel(geometryOf(cavity)) }
}

export async function editCavity(db: Db, id: string, patch: CavityPatch): Promise<Cavity> {
  const current = await getCavity(db, id)
  // Check the geometry as it will be after the edit; analyses keep their own snapshot, so history is untouched.
  computeCavityModel(geometryOf({ ...current, ...patch }))
  try {
    const updated = await updateCavity(db, id, patch)
    if (!updated) throw new HttpError(404, 'cavity_not_found', `No cavity with id ${id}.`)
    return updated
  } catch (error) {
    if (isUniqueViolation(error)) throw new HttpError(409, 'name_taken', `A cavity named "${patch.name}" already exists.`)
    throw error
  }
}

export { listCavities }

/** Data access for saved mode-matching plans: rows in, plain `SavedPlan` objects out (without pictures). */
import type { ParsedPlanRequest, SavedPlan } from '../../shared/api/plannerSchemas'
import type { Beam } from '../../shared/beam'
import type { CavityGeometry } from '../../shared/cavity'
import type { Db } from '../db/knex'

interface PlanRow {
  id: string
  cavity_id: string
  cavity_name: string
  created_by: number | null
  author_name: string | null
  note: string
  inputs: ParsedPlanRequest
  beam: Beam
  geometry: CavityGeometry
  solution: SavedPlan['solution']
  coupling: number
  created_at: Date
}

export interface NewPlan {
  cavityId: string
  createdBy: number
  note: string
  inputs: ParsedPlanRequest
  beam: Beam
  geometry: CavityGeometry
  solution: SavedPlan['solution']
  coupling: number
}

function toPlan(row: PlanRow): SavedPlan {
  return {
    id: row.id,
    cavityId: row.cavity_id,
    cavityName: row.cavity_name,
    author: row.created_by === null ? null : { id: row.created_by, name: row.author_name ?? '' },
    createdAt: row.created_at.toISOString(),
    note: row.note,
    inputs: row.inputs,
    beam: row.beam,
    geometry: row.geometry,
    solution: row.solution,
    coupling: row.coupling,
  }
}

const selectPlans = (db: Db) =>
  db('mode_matching_plans as p')
    .join('cavities as c', 'c.id', 'p.cavity_id')
    .leftJoin('users as u', 'u.id', 'p.created_by')
    .select('p.*', 'c.name as cavity_name', 'u.name as author_name')

export async function insertPlan(db: Db, plan: NewPlan): Promise<string> {
  const [row] = await db('mode_matching_plans')
    .insert({
      cavity_id: plan.cavityId,
      created_by: plan.createdBy,
      note: plan.note,
      inputs: JSON.stringify(plan.inputs),
      beam: JSON.stringify(plan.beam),
      geometry: JSON.stringify(plan.geometry),
      solution: JSON.stringify(plan.solution),
      coupling: plan.coupling,
    })
    .returning('id')
  return (row as { id: string }).id
}

export async function findPlan(db: Db, id: string): Promise<SavedPlan | null> {
  const row = (await selectPlans(db).where('p.id', id).first()) as PlanRow | undefined
  return row ? toPlan(row) : null
}

/** A cavity's plans, newest first. */
export async function listPlansOfCavity(db: Db, cavityId: string): Promise<SavedPlan[]> {
  return ((await selectPlans(db).where('p.cavity_id', cavityId).orderBy('p.created_at', 'desc').limit(200)) as PlanRow[]).map(toPlan)
}

export async function newestPlanOfCavity(db: Db, cavityId: string): Promise<SavedPlan | null> {
  const row = (await selectPlans(db).where('p.cavity_id', cavityId).orderBy('p.created_at', 'desc').first()) as PlanRow | undefined
  return row ? toPlan(row) : null
}

export async function deletePlan(db: Db, id: string): Promise<boolean> {
  return (await db('mode_matching_plans').where({ id }).delete()) > 0
}

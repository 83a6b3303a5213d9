/**
 * Mode-matching planner use cases: plan a cavity's input optics from the lab's kit (a pure computation), save,
 * list, read and delete plans, and read an analysis's order-2 share as the family of waist errors it allows.
 */
import { can } from '../../shared/auth/permissions'
import { cavityEigenmodeBeam, lensPositionTolerance, mismatchFamily, type Beam, type MatchingPath } from '../../shared/beam'
import type { Lens, MismatchFamilyAnswer, ParsedPlanRequest, PlacedKitLens, PlanAnswer, SavedPlan } from '../../shared/api/plannerSchemas'
import type { planSaveSchema } from '../../shared/api/plannerSchemas'
import type { CavityGeometry } from '../../shared/cavity'
import type { z } from 'zod'
import type { Actor } from '../auth/actor'
import { getAnalysis } from '../analyses/analysisService'
import { geometryOf, getCavity } from '../cavities/cavityService'
import type { Db } from '../db/knex'
import { HttpError } from '../http/errors'
import { listLenses } from '../lenses/lensRepository'
import { computePlanAnswer, resolveBeam, type PlanLimits } from './computePlanAnswer'
import { beamPathPicture, couplingMapPicture, round6 } from './planPictures'
import { computePlanInThread } from './planPool'
import { deletePlan, findPlan, insertPlan, listPlansOfCavity, newestPlanOfCavity } from './planRepository'

type ParsedPlanSave = z.infer<typeof planSaveSchema>

/** The kit lenses the planner may use at this wavelength, and why the others are left out. */
export function usableKit(lenses: readonly Lens[], wavelengthNm: number, lensIds?: readonly string[]) {
  let chosen = [...lenses]
  if (lensIds !== undefined) {
    const known = new Set(lenses.map((lens) => lens.id))
    const unknown = lensIds.filter((id) => !known.has(id))
    if (unknown.length > 0) throw new HttpError(422, 'unknown_lens', `The kit has no lens with id ${unknown.join(', ')}; reload the kit.`)
    const wanted = new Set(lensIds)
    chosen = chosen.filter((lens) => wanted.has(lens.id))
  }
  const left: { label: string; reason: string }[] = []
  const used: Lens[] = []
  for (const lens of chosen) {
    if (lens.count === 0) left.push({ label: lens.label, reason: 'none in stock (count 0)' })
    else if (lens.type === 'cylindrical') left.push({ label: lens.label, reason: 'cylindrical: the planner uses lenses that focus both axes' })
    else if ((lens.wavelengthMinNm != null && wavelengthNm < lens.wavelengthMinNm) || (lens.wavelengthMaxNm != null && wavelengthNm > lens.wavelengthMaxNm)) {
      left.push({ label: lens.label, reason: `coated for ${lens.wavelengthMinNm ?? '…'}–${lens.wavelengthMaxNm ?? '…'} nm, not ${wavelengthNm} nm` })
    } else used.push(lens)
  }
  return { used, left }
}

/**
 * Plan the cavity's input optics from the lab's kit. The search runs in a worker thread unless `inThread` is false
 * (the demo seed, which runs outside a server).
 */
export async function planForCavity(
  db: Db,
  cavityId: string,
  request: ParsedPlanRequest,
  options: { inThread?: boolean; limits?: PlanLimits; signal?: AbortSignal } = {},
): Promise<PlanAnswer> {
  const { inThread = true, limits, signal } = options
  const cavity = await getCavity(db, cavityId)
  const { used, left } = usableKit(await listLenses(db), cavity.wavelengthNm, request.lensIds)
  if (used.length === 0) {
    const why = left.length === 0 ? 'The lens kit is empty: add the lenses the lab has on the Lens kit page before planning.' : `None of the kit's lenses can be used here (${left.slice(0, 5).map((l) => `${l.label}: ${l.reason}`).join('; ')}${left.length > 5 ? '; …' : ''}).`
    throw new HttpError(422, 'empty_kit', why)
  }
  const computation = { cavity: { id: cavity.id, name: cavity.name, wavelengthNm: cavity.wavelengthNm }, geometry: geometryOf(cavity), used, left, request, limits }
  return inThread ? computePlanInThread(computation, signal) : computePlanAnswer(computation)
}

/** The matching path and the cavity mode on it, from a beam, a geometry and the laser-to-cavity distance. */
function pathOf(beam: Beam, geometry: CavityGeometry, laserToCavityMm: number) {
  const target = cavityEigenmodeBeam(geometry)
  const path: MatchingPath = { beam, target, cavityPlaneMm: laserToCavityMm }
  const waistMm = laserToCavityMm + target.insideWaistFromMirror1Mm
  const axis = { waistRadiusMm: target.insideWaistRadiusMm, waistPositionMm: waistMm, m2: 1 }
  const cavityMode = { beam: { wavelengthNm: target.wavelengthNm, x: axis, y: axis }, fromMm: laserToCavityMm, toMm: laserToCavityMm + target.cavityLengthMm }
  return { path, cavityMode, target }
}

export async function savePlan(db: Db, cavityId: string, input: ParsedPlanSave, actor: Actor): Promise<SavedPlan> {
  const cavity = await getCavity(db, cavityId)
  const geometry = geometryOf(cavity)
  const { beam } = resolveBeam(input.inputs.beam, cavity.wavelengthNm)
  const kit = new Map((await listLenses(db)).map((lens) => [lens.id, lens]))
  const { laserToCavityMm } = input.inputs.table
  const lenses: PlacedKitLens[] = input.lenses
    .map((lens, i) => {
      if (lens.zMm <= 0 || lens.zMm >= laserToCavityMm) {
        throw new HttpError(422, 'lens_outside_path', `lenses[${i}] stands at ${lens.zMm} mm, outside the path from the laser (0 mm) to the cavity (${laserToCavityMm} mm).`)
      }
      if (lens.lensId === undefined) return { lensId: null, label: `f = ${round6(lens.focalLengthMm!)} mm (to buy)`, type: null, focalLengthMm: lens.focalLengthMm!, zMm: lens.zMm }
      const fromKit = kit.get(lens.lensId)
      if (!fromKit) throw new HttpError(422, 'unknown_lens', `lenses[${i}]: the kit has no lens with id ${lens.lensId}; reload the kit.`)
      return { lensId: fromKit.id, label: fromKit.label, type: fromKit.type, focalLengthMm: fromKit.focalLengthMm, zMm: lens.zMm }
    })
    .sort((a, b) => a.zMm - b.zMm)
  const { path } = pathOf(beam, geometry, laserToCavityMm)
  const tolerance = lensPositionTolerance(path, lenses, input.inputs.toleranceMm)
  const id = await insertPlan(db, {
    cavityId,
    createdBy: actor.id,
    note: input.note,
    inputs: input.inputs,
    beam,
    geometry,
    solution: { lenses, coupling: tolerance.coupling, tolerance },
    coupling: tolerance.coupling,
  })
  return getPlan(db, id)
}

export async function listPlans(db: Db, cavityId: string): Promise<SavedPlan[]> {
  await getCavity(db, cavityId)
  return listPlansOfCavity(db, cavityId)
}

/** A saved plan with its pictures, recomputed from the stored beam, geometry and lenses. */
export async function getPlan(db: Db, id: string): Promise<SavedPlan> {
  const plan = await findPlan(db, id)
  if (!plan) throw new HttpError(404, 'plan_not_found', `No plan with id ${id}.`)
  const { path, cavityMode } = pathOf(plan.beam, plan.geometry, plan.inputs.table.laserToCavityMm)
  const { lenses } = plan.solution
  return {
    ...plan,
    pictures: {
      path: beamPathPicture(path, cavityMode, lenses),
      map: lenses.length === 2 ? couplingMapPicture(path, lenses, 0, plan.inputs.table) : null,
    },
  }
}

/** Its author, a lead or an admin may delete a plan. */
export async function removePlan(db: Db, id: string, actor: Actor): Promise<void> {
  const plan = await findPlan(db, id)
  if (!plan) throw new HttpError(404, 'plan_not_found', `No plan with id ${id}.`)
  if (plan.author?.id !== actor.id && !can(actor.role, 'plans.manageAny')) {
    throw new HttpError(403, 'forbidden', 'Only the plan’s author, a lead or an admin may delete it.')
  }
  await deletePlan(db, id)
}

const MISMATCH_STEPS_MM = [0.5, 1, 2, 5]

/**
 * An analysis's order-2 share as the family of waist-size / waist-position errors it allows (power alone cannot
 * pick one), and what moving each lens of a saved plan of that cavity would change.
 */
export async function mismatchForAnalysis(db: Db, analysisId: string, planId?: string): Promise<MismatchFamilyAnswer> {
  const analysis = await getAnalysis(db, analysisId)
  if (analysis.status !== 'done' || !analysis.result) {
    throw new HttpError(409, 'analysis_not_done', `Analysis ${analysisId} is ${analysis.status}; the mismatch family needs a finished analysis.`)
  }
  const order2Share = analysis.result.orders['2'] ?? 0
  const target = cavityEigenmodeBeam(analysis.geometry)
  const mode = { waistRadiusMm: target.insideWaistRadiusMm, rayleighRangeMm: target.rayleighRangeMm }
  const family = mismatchFamily(order2Share, mode)
  let plan: MismatchFamilyAnswer['plan'] = null
  const stored = planId ? await findPlan(db, planId) : await newestPlanOfCavity(db, analysis.cavityId)
  if (planId && !stored) throw new HttpError(404, 'plan_not_found', `No plan with id ${planId}.`)
  if (stored) {
    if (stored.cavityId !== analysis.cavityId) throw new HttpError(422, 'plan_of_other_cavity', 'The plan belongs to another cavity than the analysis.')
    const { path } = pathOf(stored.beam, stored.geometry, stored.inputs.table.laserToCavityMm)
    plan = {
      id: stored.id,
      createdAt: stored.createdAt,
      lenses: stored.solution.lenses,
      coupling: stored.coupling,
      steps: MISMATCH_STEPS_MM.map((step) => lensPositionTolerance(path, stored.solution.lenses, step)),
    }
  }
  const pct = (f: number) => `${(100 * f).toFixed(1)} %`
  const reading =
    order2Share <= 0
      ? 'This scan shows no order-2 power: no waist-size or waist-position error is visible.'
      : `Order 2 holds ${pct(order2Share)} of the power. A waist ${family.pureSize.largerRatio.toFixed(2)}× or ${family.pureSize.smallerRatio.toFixed(2)}× the mode's (size error alone), ` +
        `or one ${family.purePositionMm.toFixed(1)} mm off along the beam (position error alone), or any mix on the curve explains it; power alone cannot tell which.`
  return {
    analysisId: analysis.id,
    cavityId: analysis.cavityId,
    analysedAt: analysis.finishedAt ?? analysis.createdAt,
    order2Share,
    fundamentalFraction: analysis.result.fundamentalFraction,
    mode,
    family,
    plan,
    reading,
  }
}

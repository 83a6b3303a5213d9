/**
 * Typed calls for the lens kit and the mode-matching planner. JSON goes through `apiRequest`; the CSV import
 * sends the file as multipart (FormData), and the export is a plain link the browser downloads.
 */
import type {
  Lens,
  LensImportResult,
  LensInput,
  LensPatch,
  MismatchFamilyAnswer,
  PlanAnswer,
  PlanRequest,
  PlanSave,
  SavedPlan,
} from '../../shared/api/plannerSchemas'
import { apiRequest } from './client'

export type { Lens, LensImportResult, LensInput, LensPatch, MismatchFamilyAnswer, PlanAnswer, PlanRequest, PlanSave, SavedPlan }

const enc = encodeURIComponent

/** Address of the kit's CSV export (a link with `download`). */
export const lensCsvUrl = '/api/lenses.csv'

export function listLenses(signal?: AbortSignal): Promise<{ lenses: Lens[] }> {
  return apiRequest('/lenses', { signal })
}

export function createLens(input: LensInput): Promise<{ lens: Lens }> {
  return apiRequest('/lenses', { method: 'POST', body: input })
}

export function editLens(id: string, patch: LensPatch): Promise<{ lens: Lens }> {
  return apiRequest(`/lenses/${enc(id)}`, { method: 'PATCH', body: patch })
}

export function deleteLens(id: string): Promise<null> {
  return apiRequest(`/lenses/${enc(id)}`, { method: 'DELETE' })
}

/** Import a kit CSV (all or nothing): lines with a known label update that lens, others add one. */
export function importLensCsv(file: File): Promise<LensImportResult> {
  const form = new FormData()
  form.append('file', file, file.name)
  return apiRequest('/lenses/import', { method: 'POST', body: form })
}

/** Plan the cavity's input optics from the kit (computes, stores nothing). */
export function planCavity(cavityId: string, request: PlanRequest, signal?: AbortSignal): Promise<PlanAnswer> {
  return apiRequest(`/cavities/${enc(cavityId)}/plan`, { method: 'POST', body: request, signal })
}

export function listPlans(cavityId: string, signal?: AbortSignal): Promise<{ cavityId: string; plans: SavedPlan[] }> {
  return apiRequest(`/cavities/${enc(cavityId)}/plans`, { signal })
}

export function savePlan(cavityId: string, plan: PlanSave): Promise<{ plan: SavedPlan }> {
  return apiRequest(`/cavities/${enc(cavityId)}/plans`, { method: 'POST', body: plan })
}

export function getPlan(id: string, signal?: AbortSignal): Promise<{ plan: SavedPlan }> {
  return apiRequest(`/plans/${enc(id)}`, { signal })
}

export function deletePlan(id: string): Promise<null> {
  return apiRequest(`/plans/${enc(id)}`, { method: 'DELETE' })
}

/** An analysis's order-2 share as waist errors, with the lens tolerance of the cavity's newest plan (or `planId`'s). */
export function getMismatchFamily(analysisId: string, planId?: string, signal?: AbortSignal): Promise<MismatchFamilyAnswer> {
  return apiRequest(`/analyses/${enc(analysisId)}/mismatch-family${planId ? `?planId=${enc(planId)}` : ''}`, { signal })
}

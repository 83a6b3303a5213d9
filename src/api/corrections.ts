/** Typed calls for undoing a wrong upload and for the fit check (see shared/api/correctionSchemas.ts). */
import type { DeletedTrace, FitCheck } from '../../shared/api/correctionSchemas'
import type { AnalysisRecord, TraceRecord } from '../../shared/api/tuningTypes'
import { apiRequest } from './client'

export type { DeletedTrace, FitCheck }

const enc = encodeURIComponent

export function deleteTrace(traceId: string, reason: string): Promise<{ trace: TraceRecord; restoreUntil: string }> {
  return apiRequest(`/traces/${enc(traceId)}`, { method: 'DELETE', body: { reason } })
}

export function moveTrace(traceId: string, cavityId: string, reason: string): Promise<{ trace: TraceRecord; analysis: AnalysisRecord }> {
  return apiRequest(`/traces/${enc(traceId)}/move`, { method: 'POST', body: { cavityId, reason } })
}

export function excludeAnalysis(analysisId: string, reason: string): Promise<{ analysis: AnalysisRecord }> {
  return apiRequest(`/analyses/${enc(analysisId)}/exclusion`, { method: 'PUT', body: { reason } })
}

export function includeAnalysis(analysisId: string): Promise<{ analysis: AnalysisRecord }> {
  return apiRequest(`/analyses/${enc(analysisId)}/exclusion`, { method: 'DELETE' })
}

export function getFitCheck(analysisId: string, signal?: AbortSignal): Promise<{ fitCheck: FitCheck }> {
  return apiRequest(`/analyses/${enc(analysisId)}/fit-check`, { signal })
}

export function restoreTrace(traceId: string): Promise<{ trace: TraceRecord }> {
  return apiRequest(`/traces/${enc(traceId)}/restore`, { method: 'POST' })
}

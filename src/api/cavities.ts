/**
 * Typed calls for the cavity, trace and analysis API. JSON requests go through `apiRequest`; the two
 * that JSON cannot carry live here too: the multipart upload (XMLHttpRequest, because fetch reports no
 * upload progress) and the raw trace download (bytes for the browser-side trace reader).
 */
import type { AnalysisOptions, AnalysisStatus, Cavity, CavityInput, CavityPatch } from '../../shared/api/cavitySchemas'
import type { AnalysisEvent, AnalysisRecord, HistoryRow, TraceRecord, UploadOutcome } from '../../shared/api/tuningTypes'
import type { CavityModel } from '../../shared/cavity'
import { ApiError, apiRequest } from './client'

export type { AnalysisEvent, AnalysisOptions, AnalysisRecord, AnalysisStatus, Cavity, CavityInput, CavityPatch, UploadOutcome }

/** One row of `GET /api/cavities/:id/history`. */
export type CavityHistoryRow = HistoryRow
/** A stored upload. */
export type StoredTrace = TraceRecord

const enc = encodeURIComponent

export function listCavities(options: { archived?: boolean; signal?: AbortSignal } = {}): Promise<{ cavities: Cavity[] }> {
  return apiRequest(`/cavities${options.archived ? '?archived=true' : ''}`, { signal: options.signal })
}

export function createCavity(input: CavityInput): Promise<{ cavity: Cavity }> {
  return apiRequest('/cavities', { method: 'POST', body: input })
}

/** Cavities proposed by experimenters, waiting for a lead or an admin. */
export function listProposals(signal?: AbortSignal): Promise<{ cavities: Cavity[] }> {
  return apiRequest('/cavity-proposals', { signal })
}

export function proposeCavity(input: CavityInput): Promise<{ cavity: Cavity }> {
  return apiRequest('/cavity-proposals', { method: 'POST', body: input })
}

export function approveCavity(id: string): Promise<{ cavity: Cavity }> {
  return apiRequest(`/cavities/${enc(id)}/approve`, { method: 'POST' })
}

export function rejectProposal(id: string): Promise<null> {
  return apiRequest(`/cavity-proposals/${enc(id)}`, { method: 'DELETE' })
}

export function getCavity(id: string, signal?: AbortSignal): Promise<{ cavity: Cavity; model: CavityModel }> {
  return apiRequest(`/cavities/${enc(id)}`, { signal })
}

export function editCavity(id: string, patch: CavityPatch): Promise<{ cavity: Cavity }> {
  return apiRequest(`/cavities/${enc(id)}`, { method: 'PATCH', body: patch })
}

export function getCavityHistory(
  id: string,
  query: { from?: string; to?: string; limit?: number } = {},
  signal?: AbortSignal,
): Promise<{ cavityId: string; analyses: CavityHistoryRow[] }> {
  const params = new URLSearchParams()
  if (query.from) params.set('from', query.from)
  if (query.to) params.set('to', query.to)
  if (query.limit !== undefined) params.set('limit', String(query.limit))
  const search = params.toString()
  return apiRequest(`/cavities/${enc(id)}/history${search ? `?${search}` : ''}`, { signal })
}

/** Address of a cavity's server-sent event stream, for `EventSource`. */
export function cavityEventsUrl(id: string): string {
  return `/api/cavities/${enc(id)}/events`
}

export function getTrace(id: string, signal?: AbortSignal): Promise<{ trace: StoredTrace; analyses: Array<Pick<AnalysisRecord, 'id' | 'status' | 'createdAt' | 'options'>> }> {
  return apiRequest(`/traces/${enc(id)}`, { signal })
}

export function getAnalysis(id: string, signal?: AbortSignal): Promise<AnalysisRecord> {
  return apiRequest(`/analyses/${enc(id)}`, { signal })
}

export function requestAnalysis(traceId: string, options: AnalysisOptions): Promise<{ analysis: AnalysisRecord }> {
  return apiRequest(`/traces/${enc(traceId)}/analyses`, { method: 'POST', body: options })
}

/** The raw export as stored (the server sends it gzip-encoded; the browser decompresses it). */
export async function downloadTraceBytes(traceId: string, signal?: AbortSignal): Promise<Uint8Array> {
  let response: Response
  try {
    response = await fetch(`/api/traces/${enc(traceId)}/file`, { credentials: 'same-origin', signal })
  } catch (error) {
    throw new ApiError(0, 'network', `The server could not be reached (${(error as Error).message}).`)
  }
  if (!response.ok) throw await errorFromResponse(response.status, await response.text())
  return new Uint8Array(await response.arrayBuffer())
}

export interface UploadProgress {
  loadedBytes: number
  totalBytes: number
}

export interface UploadRequest {
  files: File[]
  note?: string
  /** Seconds between samples, for exports without a time column. */
  sampleIntervalSeconds?: number
  onProgress?: (progress: UploadProgress) => void
  signal?: AbortSignal
}

/** `POST /api/cavities/:id/traces` as multipart, reporting upload progress. */
export function uploadTraces(cavityId: string, request: UploadRequest): Promise<{ uploads: UploadOutcome[] }> {
  const { files, note = '', sampleIntervalSeconds, onProgress, signal } = request
  const form = new FormData()
  for (const file of files) form.append('file', file, file.name)
  if (note.trim()) form.append('note', note.trim())
  if (sampleIntervalSeconds !== undefined) form.append('sampleIntervalSeconds', String(sampleIntervalSeconds))
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest()
    xhr.open('POST', `/api/cavities/${enc(cavityId)}/traces`)
    xhr.withCredentials = true
    xhr.setRequestHeader('Accept', 'application/json')
    xhr.upload.onprogress = (event) => onProgress?.({ loadedBytes: event.loaded, totalBytes: event.lengthComputable ? event.total : 0 })
    xhr.onload = () => {
      if (xhr.status >= 200 && xhr.status < 300) {
        const payload = parseJson(xhr.responseText)
        if (payload) resolve(payload as { uploads: UploadOutcome[] })
        else reject(new ApiError(xhr.status, 'bad_answer', 'The server’s answer to the upload could not be read.'))
      } else {
        void errorFromResponse(xhr.status, xhr.responseText).then(reject)
      }
    }
    xhr.onerror = () => reject(new ApiError(0, 'network', 'The upload was interrupted: the server could not be reached.'))
    xhr.onabort = () => reject(new ApiError(0, 'aborted', 'The upload was cancelled.'))
    signal?.addEventListener('abort', () => xhr.abort(), { once: true })
    xhr.send(form)
  })
}

async function errorFromResponse(status: number, text: string): Promise<ApiError> {
  const error = (parseJson(text) as { error?: { code?: string; message?: string } } | null)?.error
  if (status === 413 && !error) return new ApiError(413, 'file_too_large', 'The file is larger than the server accepts.')
  return new ApiError(status, error?.code ?? 'http_error', error?.message ?? `The server answered ${status}.`)
}

function parseJson(text: string): unknown {
  try {
    return text ? JSON.parse(text) : null
  } catch {
    return null
  }
}

/**
 * Worker-thread entry (piscina): decompress a stored export, read it and analyse it. Runs off the
 * request thread. Bad input comes back as `{ ok: false, error }` (it will fail the same way on a
 * retry); anything else throws, so the job is retried.
 */
import { workerData } from 'node:worker_threads'
import { gunzipSync } from 'node:zlib'
import type { CavityGeometry } from '../../shared/cavity'
import { analyzeTrace } from '../../shared/analysis/analyzeTrace'
import type { AnalysisResult, AnalyzeOptions } from '../../shared/analysis/types'
import { warmUpAnalysis } from '../../shared/analysis/warmUpAnalysis'
import { isEngineError } from '../../shared/errors'
import { readTrace } from '../../shared/trace/readTrace'

export interface AnalysisTask {
  /** The export as stored: gzip-compressed bytes. */
  gzipped: Uint8Array
  geometry: CavityGeometry
  options: AnalyzeOptions & { sampleIntervalSeconds?: number }
  maxBytes: number
  /** The cavity's remembered sample interval (s), tried when the export has no time axis and none was given. */
  fallbackIntervalSeconds?: number | null
}

export type AnalysisOutcome = { ok: true; result: AnalysisResult; milliseconds: number } | { ok: false; error: { code: string; message: string } }

// A fresh thread spends about twice the CPU on its first analysis while the engine compiles its hot
// loops; do that on a small generated trace before the first upload arrives.
if ((workerData as { warmUp?: boolean } | undefined)?.warmUp) warmUpAnalysis()

/** Read with the given interval; without one, fall back to the cavity's remembered one only when the file needs it. */
function readExport(bytes: Uint8Array, task: AnalysisTask, sampleIntervalSeconds: number | undefined) {
  try {
    return readTrace(bytes, { maxBytes: task.maxBytes, sampleIntervalSeconds })
  } catch (error) {
    const fallback = task.fallbackIntervalSeconds
    if (sampleIntervalSeconds !== undefined || !fallback || !isEngineError(error) || error.code !== 'no_sample_interval') throw error
    return readTrace(bytes, { maxBytes: task.maxBytes, sampleIntervalSeconds: fallback })
  }
}

export default function runAnalysisTask(task: AnalysisTask): AnalysisOutcome {
  const started = performance.now()
  let bytes: Uint8Array
  try {
    bytes = gunzipSync(task.gzipped, { maxOutputLength: task.maxBytes + 1 })
  } catch {
    return { ok: false, error: { code: 'file_too_large', message: `The stored file is larger than the ${Math.round(task.maxBytes / 1048576)} MB limit once decompressed.` } }
  }
  try {
    const { sampleIntervalSeconds, ...options } = task.options
    const trace = readExport(bytes, task, sampleIntervalSeconds)
    const result = analyzeTrace(trace, task.geometry, options)
    return { ok: true, result, milliseconds: performance.now() - started }
  } catch (error) {
    if (isEngineError(error)) return { ok: false, error: { code: error.code, message: error.message } }
    throw error
  }
}

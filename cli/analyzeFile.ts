/** One export read and analysed, as the command line reports it: the result, or the reason it was refused. */
import { analyzeTrace } from '../shared/analysis/analyzeTrace'
import type { AnalysisResult, AnalyzeOptions } from '../shared/analysis/types'
import type { CavityGeometry } from '../shared/cavity/geometrySchema'
import { isEngineError } from '../shared/errors'
import { readTrace } from '../shared/trace/readTrace'
import { readTraceBytes } from './readInputs'

export interface Refusal {
  code: string
  message: string
}

export type FileOutcome = { file: string; result: AnalysisResult } | { file: string; error: Refusal }

/** Never throws: a file the engine refuses, or a fault in the engine itself, comes back as `error`. */
export function analyzeFile(file: string, cavity: CavityGeometry, options: AnalyzeOptions): FileOutcome {
  try {
    const trace = readTrace(readTraceBytes(file))
    return { file, result: analyzeTrace(trace, cavity, options) }
  } catch (error) {
    if (isEngineError(error)) return { file, error: { code: error.code, message: error.message } }
    return { file, error: { code: 'internal_error', message: `The analysis failed unexpectedly (${error instanceof Error ? error.message : String(error)}); please report this file.` } }
  }
}

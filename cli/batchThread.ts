/**
 * Worker-thread entry of a batch (`cavitrace analyze FILE... | DIR`): takes file names one at a time from the main
 * thread, reads and analyses each, and answers with the finished output text (a JSON line or a CSV row), so the
 * main thread only writes.
 */
import { parentPort, workerData } from 'node:worker_threads'
import type { AnalyzeOptions } from '../shared/analysis/types'
import type { CavityGeometry } from '../shared/cavity/geometrySchema'
import { analyzeFile } from './analyzeFile'
import { formatOutcome, type OutputFormat } from './formatOutcome'

export interface BatchThreadData {
  cavity: CavityGeometry
  options: AnalyzeOptions
  format: OutputFormat
}

export interface BatchRequest {
  index: number
  file: string
}

export interface BatchAnswer {
  index: number
  text: string
  refused: boolean
}

const { cavity, options, format } = workerData as BatchThreadData
parentPort!.on('message', ({ index, file }: BatchRequest) => {
  const outcome = analyzeFile(file, cavity, options)
  const answer: BatchAnswer = { index, text: formatOutcome(outcome, format), refused: 'error' in outcome }
  parentPort!.postMessage(answer)
})

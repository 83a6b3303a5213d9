/**
 * Analyse many exports in one process on worker threads (one per core unless told otherwise) and write each
 * outcome in input order as soon as every file before it is done. A file that is refused, or that crashes its
 * thread, is written as an error and the batch goes on.
 */
import { Worker } from 'node:worker_threads'
import type { AnalyzeOptions } from '../shared/analysis/types'
import type { CavityGeometry } from '../shared/cavity/geometrySchema'
import type { BatchAnswer, BatchRequest, BatchThreadData } from './batchThread'
import { formatOutcome, type OutputFormat } from './formatOutcome'
import { createProgressBar } from './progressBar'

export interface BatchOptions {
  cavity: CavityGeometry
  options: AnalyzeOptions
  format: OutputFormat
  threads: number
  write: (text: string) => void
}

/** Resolves with the number of refused files once every file is written. */
export function runBatch(files: string[], batch: BatchOptions): Promise<number> {
  const fromSource = import.meta.url.endsWith('.ts')
  // Built, the tool is CommonJS (scripts/build.mjs).
  const threadFile = new URL(fromSource ? './batchThread.ts' : './batchThread.cjs', import.meta.url)
  const data: BatchThreadData = { cavity: batch.cavity, options: batch.options, format: batch.format }
  const texts: (string | undefined)[] = new Array(files.length)
  const progress = createProgressBar(files.length)
  let nextToSend = 0
  let nextToWrite = 0
  let done = 0
  let refused = 0

  return new Promise((resolve) => {
    const finish = (index: number, text: string, wasRefused: boolean) => {
      texts[index] = text
      done++
      if (wasRefused) refused++
      while (nextToWrite < files.length && texts[nextToWrite] !== undefined) {
        batch.write(texts[nextToWrite]!)
        texts[nextToWrite++] = ''
      }
      progress.update(done, refused)
      if (done === files.length) {
        progress.end()
        resolve(refused)
      }
    }

    const startThread = () => {
      const worker = new Worker(threadFile, { workerData: data, execArgv: fromSource ? ['--import', 'tsx'] : [] })
      let current: BatchRequest | null = null
      const sendNext = () => {
        if (nextToSend >= files.length) {
          current = null
          void worker.terminate()
          return
        }
        current = { index: nextToSend, file: files[nextToSend++] }
        worker.postMessage(current)
      }
      worker.on('message', (answer: BatchAnswer) => {
        finish(answer.index, answer.text, answer.refused)
        sendNext()
      })
      worker.on('error', (error) => {
        // The thread died (out of memory, a fault outside the engine): this file fails, a new thread takes the rest.
        if (current) {
          const failed = current
          current = null
          finish(failed.index, formatOutcome({ file: failed.file, error: { code: 'internal_error', message: `The analysis thread stopped: ${error.message}` } }, batch.format), true)
          if (nextToSend < files.length) startThread()
        }
      })
      sendNext()
    }

    if (files.length === 0) {
      resolve(0)
      return
    }
    for (let i = 0; i < Math.min(batch.threads, files.length); i++) startThread()
  })
}

/**
 * A pool of worker threads (piscina) that run the analysis engine. From `.ts` sources (tsx, tests)
 * the threads load the tsx loader; from built `.js` they do not need it.
 */
import { Piscina } from 'piscina'
import type { AnalysisOutcome, AnalysisTask } from './analysisThread'

export interface AnalysisPool {
  run(task: AnalysisTask): Promise<AnalysisOutcome>
  close(): Promise<void>
}

export function createAnalysisPool(options: { threads: number; warmUp?: boolean }): AnalysisPool {
  const runningTs = import.meta.url.endsWith('.ts')
  const pool = new Piscina({
    filename: new URL(runningTs ? './analysisThread.ts' : './analysisThread.js', import.meta.url).href,
    minThreads: 1,
    maxThreads: Math.max(1, options.threads),
    idleTimeout: 60_000,
    execArgv: runningTs ? ['--import', 'tsx'] : [],
    workerData: { warmUp: options.warmUp ?? false },
  })
  return {
    run(task) {
      // Transfer the compressed bytes instead of copying them.
      const transfer = task.gzipped.byteOffset === 0 && task.gzipped.byteLength === task.gzipped.buffer.byteLength ? [task.gzipped.buffer as ArrayBuffer] : []
      return pool.run(task, { transferList: transfer }) as Promise<AnalysisOutcome>
    },
    close: () => pool.destroy(),
  }
}

/**
 * The planner's worker threads (piscina), made on first use and shared by every app in the process. Idle threads
 * do not keep the process alive (piscina unrefs them), so nothing needs closing. From `.ts` sources (tsx, tests) the
 * threads load the tsx loader; from built `.js` they do not need it.
 */
import { Piscina } from 'piscina'
import type { PlanAnswer } from '../../shared/api/plannerSchemas'
import { HttpError } from '../http/errors'
import type { PlanComputation } from './computePlanAnswer'
import type { PlanOutcome } from './planThread'

let pool: Piscina | null = null
let threadsEnded = 0

/** How many planner threads have ended in this process (a cancelled search ends its thread). */
export function planThreadsEnded(): number {
  return threadsEnded
}

function planPool(): Piscina {
  if (!pool) {
    const runningTs = import.meta.url.endsWith('.ts')
    pool = new Piscina({
      filename: new URL(runningTs ? './planThread.ts' : './planThread.js', import.meta.url).href,
      minThreads: 1,
      maxThreads: 2,
      idleTimeout: 120_000,
      execArgv: runningTs ? ['--import', 'tsx'] : [],
    })
    pool.on('workerDestroy', () => {
      threadsEnded += 1
    })
  }
  return pool
}

/**
 * Compute a plan answer off the request thread; refusals become HttpError with the engine's code. Aborting `signal`
 * (the client hung up) ends the search at once: piscina terminates the thread that runs it.
 */
export async function computePlanInThread(computation: PlanComputation, signal?: AbortSignal): Promise<PlanAnswer> {
  const outcome = (await planPool().run(computation, { signal })) as PlanOutcome
  if (!outcome.ok) throw new HttpError(outcome.status, outcome.code, outcome.message)
  return outcome.answer
}

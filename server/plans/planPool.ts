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
  }
  return pool
}

/** Compute a plan answer off the request thread; refusals become HttpError with the engine's code. */
export async function computePlanInThread(computation: PlanComputation): Promise<PlanAnswer> {
  const outcome = (await planPool().run(computation)) as PlanOutcome
  if (!outcome.ok) throw new HttpError(outcome.status, outcome.code, outcome.message)
  return outcome.answer
}

/**
 * Worker-thread entry (piscina) for the planner: the search over a 40-lens kit takes most of a second, so it runs
 * here rather than on the request thread. Refusals come back as plain data (error classes do not cross threads).
 */
import { isEngineError } from '../../shared/errors'
import type { PlanAnswer } from '../../shared/api/plannerSchemas'
import { HttpError } from '../http/errors'
import { computePlanAnswer, type PlanComputation } from './computePlanAnswer'

export type PlanOutcome = { ok: true; answer: PlanAnswer } | { ok: false; status: number; code: string; message: string }

export default function runPlanTask(computation: PlanComputation): PlanOutcome {
  try {
    return { ok: true, answer: computePlanAnswer(computation) }
  } catch (error) {
    if (isEngineError(error)) return { ok: false, status: 422, code: error.code, message: error.message }
    if (error instanceof HttpError) return { ok: false, status: error.status, code: error.code, message: error.message }
    throw error
  }
}

import { EngineError } from '../errors'
import type { Trace } from '../trace/types'

/** The sample indices of a sweep part given in seconds (start inclusive, end exclusive). */
export function indexRange(trace: Trace, part: { startTime: number; endTime: number }): { startIndex: number; endIndex: number } {
  if (!(part.endTime > part.startTime)) {
    throw new EngineError('invalid_sweep_part', `sweepPart.endTime (${part.endTime}) must be after startTime (${part.startTime})`)
  }
  return {
    startIndex: Math.ceil((part.startTime - trace.startTime) / trace.sampleInterval),
    endIndex: Math.floor((part.endTime - trace.startTime) / trace.sampleInterval) + 1,
  }
}

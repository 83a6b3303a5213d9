import type { SweptTrace } from '../../../shared/sim'
import type { Trace } from '../../../shared/trace/types'

/** Wraps a generated trace in the reader's `Trace` shape (transmission first, ramp second when present). */
export function traceFromSim(sim: SweptTrace): Trace {
  const channels: Trace['channels'] = [
    { name: 'CH2', unit: 'V', values: sim.transmissionV, role: 'transmission', roleEvidence: 'generated' },
  ]
  if (sim.rampV) channels.push({ name: 'CH1', unit: 'V', values: sim.rampV, role: 'ramp', roleEvidence: 'generated' })
  return {
    sampleCount: sim.tSeconds.length,
    sampleInterval: sim.sampleIntervalSeconds,
    startTime: sim.tSeconds[0],
    time: sim.tSeconds,
    channels,
    metadata: {},
    warnings: [],
  }
}

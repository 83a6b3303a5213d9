import { EngineError } from '../errors'
import type { Trace, TraceChannel } from '../trace/types'

export interface PickedChannels {
  transmission: TraceChannel
  ramp: TraceChannel | null
}

/**
 * Chooses the transmission and ramp channels: the caller's choice (name or 0-based index) first, then the
 * roles the reader detected, then the first channel that is not the ramp.
 */
export function pickChannels(trace: Trace, transmission?: string | number, ramp?: string | number | null): PickedChannels {
  if (trace.channels.length === 0) throw new EngineError('no_channels', 'The trace holds no channels')
  const chosenTransmission =
    transmission !== undefined
      ? byKey(trace, transmission, 'transmissionChannel')
      : trace.channels.find((c) => c.role === 'transmission') ??
        trace.channels.find((c) => c.role !== 'ramp') ??
        trace.channels[0]
  let chosenRamp: TraceChannel | null = null
  if (ramp !== null) {
    chosenRamp = ramp !== undefined ? byKey(trace, ramp, 'rampChannel') : trace.channels.find((c) => c.role === 'ramp') ?? null
    if (chosenRamp === chosenTransmission) chosenRamp = null
  }
  return { transmission: chosenTransmission, ramp: chosenRamp }
}

function byKey(trace: Trace, key: string | number, option: string): TraceChannel {
  const found = typeof key === 'number' ? trace.channels[key] : trace.channels.find((c) => c.name === key) ?? trace.channels[Number(key)]
  if (!found) {
    const names = trace.channels.map((c) => c.name).join(', ')
    throw new EngineError('unknown_channel', `${option} ${JSON.stringify(key)} matches no channel (channels: ${names})`)
  }
  return found
}

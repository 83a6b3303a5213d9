import { EngineError } from '../errors'
import { estimateBaseline } from './estimateBaseline'
import { estimateNoise } from './estimateNoise'

export interface PreparedSignal {
  signal: Float64Array
  sigmaV: number
  darkLevelV: number
  quantumV: number
}

/** Baseline-subtracted signal with its noise level. */
export function prepareSignal(part: Float64Array): PreparedSignal {
  const noise = estimateNoise(part)
  const sigmaV = Math.max(noise.sigmaV, 1e-9 * spanOf(part))
  const { baselineV, darkLevelV } = estimateBaseline(part, sigmaV, { quantumV: noise.quantumV })
  // The baseline's own array becomes the signal (one array less on long records).
  const signal = subtractInPlace(part, baselineV)
  return { signal, sigmaV, darkLevelV, quantumV: noise.quantumV }
}

/** part − baseline, written over the baseline's array (non-finite samples become 0). */
function subtractInPlace(part: Float64Array, baselineV: Float64Array): Float64Array {
  for (let i = 0; i < part.length; i++) {
    const v = part[i]
    baselineV[i] = v - v === 0 ? v - baselineV[i] : 0
  }
  return baselineV
}

export function assertVaries(values: Float64Array): void {
  if (!(spanOf(values) > 0)) {
    throw new EngineError('constant_signal', 'The transmission signal is constant: no resonances can be found')
  }
}

function spanOf(values: Float64Array): number {
  let lo = Infinity
  let hi = -Infinity
  for (let i = 0; i < values.length; i++) {
    const v = values[i]
    if (v < lo) lo = v
    if (v > hi) hi = v
  }
  return hi - lo
}

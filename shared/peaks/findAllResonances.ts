import { EngineError } from '../errors'
import { median } from '../numbers'
import { findFundamentals } from '../orders/findFundamentals'
import { findResonances } from './findResonances'
import { measureResonances, type MeasuredResonance } from './measureResonances'
import { smoothSignal } from './smoothSignal'
import { rawMax, tallResonances, type TallResonance } from './tallResonances'

export interface AllResonances {
  /** The tall resonances (pass 1), with `spikeTrains` set when a dither broke them into trains. */
  tall: TallResonance[] & { spikeTrains?: boolean }
  /** Median FWHM of the tallest comb's members, samples: the TEM00 linewidth before any fit. */
  roughWidth: number
  /** Every resonance standing out at half-linewidth smoothing, measured (pass 2). */
  measured: MeasuredResonance[]
}

/**
 * The resonances of a baseline-subtracted signal in two passes: the tall ones give the linewidth; the signal is then
 * smoothed at half of it (a matched filter's scale, common practice) and every resonance standing out of the noise
 * is found and measured (area and a Lorentzian or Airy fit). Throws `no_resonances` when nothing stands out.
 */
export function findAllResonances(signal: Float64Array, sigmaV: number, options: { model?: 'lorentzian' | 'airy' } = {}): AllResonances {
  const tall = tallResonances(signal, sigmaV)
  if (tall.length === 0) {
    throw new EngineError('no_resonances', 'No resonance stands out of the noise in the selected sweep; check the channel and the sweep range')
  }
  const tallComb = findFundamentals(tall.map((m) => ({ center: m.centerIndex, height: m.heightV })))
  const roughWidth = median(tallComb.members.map((k) => tall[k].fwhmSamples))
  const halfWidth = Math.max(0, Math.floor(roughWidth / 4))
  const smooth = halfWidth > 0 ? smoothSignal(signal, { halfWidth }) : signal
  const candidates = findResonances(smooth, sigmaV / Math.sqrt(2 * halfWidth + 1), { minSeparationSamples: 0.7 * roughWidth })
  for (const c of candidates) c.maxV = rawMax(signal, c.peakIndex, halfWidth)
  if (candidates.length === 0) {
    throw new EngineError('no_resonances', 'No resonance stands out of the noise in the selected sweep; check the channel and the sweep range')
  }
  return { tall, roughWidth, measured: measureResonances(signal, candidates, sigmaV, { model: options.model ?? 'lorentzian' }) }
}

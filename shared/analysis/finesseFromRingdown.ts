import type { CavityModel } from '../cavity'
import { sweepRateAt, type SweepCalibration } from '../calibration/calibrateSweep'
import { median } from '../numbers'
import type { OrderLabel } from '../orders/assignOrders'
import { MAX_MODEL_CHI_SQUARE } from '../orders/measureOrderShares'
import { fitRingdown } from '../peaks/fitRingdown'
import type { MeasuredResonance } from '../peaks/measureResonances'

/**
 * Sweep speed s = r / (π δν²) (see SWEEP_SPEED_RINGING) and the field decay time τ = 1/(π δν): r from the FSR in
 * Hz over the median TEM00 spacing in seconds, δν the narrower of the measured and the design linewidth (ringing
 * widens the measured one).
 */
export function sweepSpeedOf(calibration: SweepCalibration | null, model: CavityModel, measuredFinesse: number | null): { speed: number; decaySeconds: number } | null {
  if (!calibration || !(calibration.fsrSeconds > 0)) return null
  const finesses = [measuredFinesse, model.designFinesse].filter((f): f is number => f !== null && f > 0)
  if (finesses.length === 0) return null
  const linewidthHz = model.fsrHz / Math.max(...finesses)
  return { speed: model.fsrHz / calibration.fsrSeconds / (Math.PI * linewidthHz * linewidthHz), decaySeconds: 1 / (Math.PI * linewidthHz) }
}

/** TEM00 resonances fitted for their ring-down, at most (the median of a few is enough). */
const RINGDOWN_FITS = 5

/**
 * The finesse from the ring-down of the TEM00 resonances (fitRingdown with the sweep rate of the calibration):
 * 𝓕 = π·τ·FSR, since δν = 1/(πτ). Each fit spans 20 apparent linewidths before the resonance and 20 linewidths
 * plus 15 decay times after it, stopping half-way to any other resonance found. The median of the converged fits,
 * with the spread of their values (or, for fewer than three, the larger fit error) as the error; null when none
 * converges.
 */
export function finesseFromRingdown(input: {
  signal: Float64Array
  measured: MeasuredResonance[]
  members: number[]
  lobes: Map<number, number>
  calibration: SweepCalibration
  tOf: (m: MeasuredResonance) => number
  startSeconds: number
  dt: number
  sigmaV: number
  fsrHz: number
  apparentFinesse: number
}): { value: number; error: number | null } | null {
  const { signal, measured, calibration, tOf, dt, fsrHz } = input
  const others = measured.map((m, i) => ({ t: tOf(m), i })).filter(({ i }) => !input.lobes.has(i)).sort((a, b) => a.t - b.t)
  const tallest = input.members.slice().sort((a, b) => measured[b].heightV - measured[a].heightV).slice(0, RINGDOWN_FITS)
  const values: { finesse: number; error: number }[] = []
  for (const k of tallest) {
    const center = tOf(measured[k])
    const rateHzPerSecond = Math.abs(sweepRateAt(calibration, center)) * fsrHz
    if (!(rateHzPerSecond > 0)) continue
    const apparentLinewidthSeconds = fsrHz / input.apparentFinesse / rateHzPerSecond
    // The ringing widens the line: the true decay time is longer than the apparent linewidth says.
    const decayGuess = 2 / (Math.PI * (fsrHz / input.apparentFinesse))
    let from = center - 20 * apparentLinewidthSeconds
    let to = center + 20 * apparentLinewidthSeconds + 15 * decayGuess
    for (const o of others) {
      if (o.i === k) continue
      if (o.t < center) from = Math.max(from, (o.t + center) / 2)
      else to = Math.min(to, (o.t + center) / 2)
    }
    const a = Math.max(0, Math.ceil((from - input.startSeconds) / dt))
    const b = Math.min(signal.length, Math.floor((to - input.startSeconds) / dt))
    if (b - a < 20) continue
    const t = Float64Array.from({ length: b - a }, (_, j) => input.startSeconds + (a + j) * dt)
    const fit = fitRingdown(t, signal.subarray(a, b), { rateHzPerSecond, guess: { centerSeconds: center, heightV: measured[k].heightV, decaySeconds: decayGuess }, sigmaV: input.sigmaV })
    if (!fit || !(fit.reducedChiSquare <= MAX_MODEL_CHI_SQUARE)) continue
    values.push({ finesse: Math.PI * fit.decaySeconds * fsrHz, error: Math.PI * fit.decayErrorSeconds * fsrHz })
  }
  if (values.length === 0) return null
  const value = median(values.map((v) => v.finesse))
  const error = values.length > 2 ? (1.4826 * median(values.map((v) => Math.abs(v.finesse - value)))) / Math.sqrt(values.length) : Math.max(...values.map((v) => v.error))
  return { value, error: Number.isFinite(error) ? error : null }
}

/**
 * Ring-down lobes: after a fast crossing the transmitted light beats for a few decay times (Poirson et al.,
 * J. Opt. Soc. Am. B 14, 2811 (1997)), and a beat can stand out as a resonance of its own. A resonance that
 * follows a taller one of the same order and kind within four decay times (intensity e⁻⁸ of the start) is such
 * a lobe: one order cannot resonate twice so close.
 */
export function ringLobes(measured: MeasuredResonance[], labels: OrderLabel[], tOf: (m: MeasuredResonance) => number, decaySeconds: number): Map<number, number> {
  const lobes = new Map<number, number>()
  const order = measured.map((_, i) => i).sort((a, b) => tOf(measured[a]) - tOf(measured[b]))
  for (let a = 0; a < order.length; a++) {
    const i = order[a]
    if (lobes.has(i) || labels[i].kind === 'unassigned') continue
    for (let b = a + 1; b < order.length; b++) {
      const j = order[b]
      if (tOf(measured[j]) - tOf(measured[i]) > 4 * decaySeconds) break
      if (labels[j].kind === labels[i].kind && labels[j].order === labels[i].order && measured[j].heightV < measured[i].heightV) lobes.set(j, i)
    }
  }
  return lobes
}

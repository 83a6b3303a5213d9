import { computeCavityModel, type CavityGeometry } from '../cavity'
import { EngineError, type EngineWarning } from '../errors'
import type { Trace } from '../trace/types'
import { selectSweep } from '../sweep/selectSweep'
import { estimateNoise } from '../peaks/estimateNoise'
import { estimateBaseline } from '../peaks/estimateBaseline'
import { findResonances } from '../peaks/findResonances'
import { measureResonances, type MeasuredResonance } from '../peaks/measureResonances'
import { calibrateSweep, frequencyAt, sweepRateAt, type SweepCalibration } from '../calibration/calibrateSweep'
import { findFundamentals } from '../orders/findFundamentals'
import { assignOrders, type OrderLabel } from '../orders/assignOrders'
import { pickChannels } from './pickChannels'
import { readingOfShares } from './readingOfShares'
import { collectWarnings } from './collectWarnings'
import type { AnalysisPeak, AnalysisResult, AnalyzeOptions } from './types'

/** Highest transverse order the assignment considers. */
const MAX_ORDER = 10

/**
 * Reads a swept-cavity trace: selects the sweep, finds and measures every resonance, calibrates time to optical
 * frequency on the TEM00 comb, labels transverse orders by the Gouy phase (Siegman, "Lasers" (1986), ch. 19) and
 * reports the TEM00 fraction, the share per order, linewidth and finesse with warnings.
 */
export function analyzeTrace(trace: Trace, cavity: CavityGeometry, options: AnalyzeOptions = {}): AnalysisResult {
  const { transmissionChannel, rampChannel, sweepPart = 'auto', gouyOverrideRad, peakModel = 'auto' } = options
  const model = computeCavityModel(cavity)
  const modulationMHz = options.modulationMHz ?? cavity.modulationMHz
  const predictedGouy = gouyOverrideRad ?? model.gouyOneWayRad
  const channels = pickChannels(trace, transmissionChannel, rampChannel)
  const values = channels.transmission.values
  assertVaries(values)
  const dt = trace.sampleInterval
  const timeAt = (index: number) => trace.startTime + index * dt

  // 1. Sweep part.
  const range = sweepPart === 'auto' ? undefined : indexRange(trace, sweepPart)
  const sweep = selectSweep(channels.ramp?.values ?? null, trace.sampleCount, { range })
  const part = values.subarray(sweep.startIndex, sweep.endIndex)

  // 2. Baseline and noise.
  const noise = estimateNoise(part)
  const sigmaV = Math.max(noise.sigmaV, 1e-9 * spanOf(part))
  const { baselineV, darkLevelV } = estimateBaseline(part, sigmaV)
  const signal = new Float64Array(part.length)
  for (let i = 0; i < part.length; i++) signal[i] = Number.isFinite(part[i]) ? part[i] - baselineV[i] : 0

  // 3. Resonances, measured by area and by fit.
  const candidates = findResonances(signal, sigmaV)
  if (candidates.length === 0) {
    throw new EngineError('no_resonances', 'No resonance stands out of the noise in the selected sweep; check the channel and the sweep range')
  }
  let measured = measureResonances(signal, candidates, sigmaV, { model: peakModel === 'airy' ? 'airy' : 'lorentzian' })
  const tOf = (m: MeasuredResonance) => timeAt(sweep.startIndex + m.centerIndex)

  // 4. TEM00 comb and calibration.
  const comb = findFundamentals(measured.map((m) => ({ center: m.centerIndex, height: m.heightV })))
  let calibration: SweepCalibration | null = null
  if (comb.members.length >= 2) {
    calibration = calibrateSweep(comb.members.map((k) => tOf(measured[k])), comb.fsrIndex)
  }
  const finesseEstimate = calibration ? finesseOf(comb.members, measured, calibration, dt, tOf).value : null
  let usedModel: 'lorentzian' | 'airy' = peakModel === 'airy' ? 'airy' : 'lorentzian'
  // Low finesse: the Lorentzian misreads the Airy wings (Born & Wolf, "Principles of Optics", §7.6).
  if (peakModel === 'auto' && calibration && finesseEstimate !== null && finesseEstimate < 25) {
    usedModel = 'airy'
    measured = measureResonances(signal, candidates, sigmaV, { model: 'airy', periodSamples: calibration.fsrSeconds / dt })
  }
  const finesse = calibration ? finesseOf(comb.members, measured, calibration, dt, tOf) : null
  const samplesPerLinewidth = median(comb.members.map((k) => measured[k].fwhmSamples))
  const linewidthFsr = finesse?.value ? 1 / finesse.value : 0.01

  // 5. Orders.
  const isFundamental = new Set(comb.members)
  const positions = measured.map((m) => (calibration ? frequencyAt(calibration, tOf(m)) : NaN))
  const toleranceFsr = Math.min(0.06, Math.max(0.02, 4 * linewidthFsr))
  let labels: OrderLabel[]
  let direction: 'up' | 'down' | 'unknown' = 'unknown'
  let measuredGouy: number | null = null
  let orderResidual: number | null = null
  if (calibration) {
    const sidebandOffsetFsr = modulationMHz ? frac((modulationMHz * 1e6) / model.fsrHz) : null
    const assignment = assignOrders(
      measured.map((m, i) => ({ positionFsr: positions[i], weight: m.heightV, fundamental: isFundamental.has(i) })),
      predictedGouy,
      { maxOrder: MAX_ORDER, toleranceFsr, sidebandOffsetFsr },
    )
    labels = assignment.labels
    direction = assignment.direction
    measuredGouy = assignment.measuredGouyRad
    orderResidual = assignment.residualRmsFsr
  } else {
    labels = measured.map((_, i) =>
      isFundamental.has(i) ? { kind: 'carrier', order: 0, residualFsr: 0 } : { kind: 'unassigned', order: null, residualFsr: NaN },
    )
  }

  // 6. Shares over whole FSR periods, so every order is counted as often as TEM00.
  const fastStructure = comb.members.some((k) => measured[k].lobeCount >= 3)
  const allFitted = comb.members.length > 0 && comb.members.every((k) => measured[k].fitted)
  const useHeight = samplesPerLinewidth >= 5 && !fastStructure && allFitted
  const power = measured.map((m) => (useHeight ? m.heightV : areaInFsr(m, calibration, dt, tOf)))
  const powerError = measured.map((m) => (useHeight ? m.heightErrorV : areaInFsr({ ...m, areaVSamples: m.areaErrorVSamples }, calibration, dt, tOf)))
  const inPeriods = measured.map((_, i) => {
    if (!calibration) return true
    const first = Math.min(...comb.fsrIndex)
    const last = Math.max(...comb.fsrIndex)
    if (last === first) return true
    return positions[i] >= first - toleranceFsr && positions[i] < last - toleranceFsr
  })
  let total = 0
  const byOrder = new Map<number, number>()
  for (let i = 0; i < measured.length; i++) {
    const l = labels[i]
    if (!inPeriods[i] || l.kind !== 'carrier' || l.order === null) continue
    total += power[i]
    byOrder.set(l.order, (byOrder.get(l.order) ?? 0) + power[i])
  }
  if (!(total > 0)) throw new EngineError('no_resonances', 'No carrier resonance could be measured in the selected sweep')
  const orders: Record<string, number> = {}
  for (const order of [...byOrder.keys()].sort((a, b) => a - b)) orders[String(order)] = byOrder.get(order)! / total
  const fundamentalFraction = orders['0'] ?? 0
  let variance = 0
  for (let i = 0; i < measured.length; i++) {
    const l = labels[i]
    if (!inPeriods[i] || l.kind !== 'carrier' || !Number.isFinite(powerError[i])) continue
    const d = l.order === 0 ? (1 - fundamentalFraction) / total : -fundamentalFraction / total
    variance += (d * powerError[i]) ** 2
  }

  const peaks: AnalysisPeak[] = measured.map((m, i) => {
    const l = labels[i]
    const counted = inPeriods[i] && l.kind === 'carrier'
    return {
      t: tOf(m),
      order: l.kind === 'unassigned' ? null : l.order,
      kind: l.kind,
      height: m.heightV,
      heightError: Number.isFinite(m.heightErrorV) ? m.heightErrorV : null,
      fwhmSeconds: m.fwhmSamples * dt,
      area: m.areaVSamples * dt,
      share: counted ? power[i] / total : 0,
      positionFsr: Number.isFinite(positions[i]) ? orientedFraction(positions[i], direction) : null,
      fitted: m.fitted,
    }
  })

  const warnings: EngineWarning[] = [
    ...trace.warnings,
    ...collectWarnings({
      part,
      signal,
      sigmaV,
      quantumV: noise.quantumV,
      measured,
      labels,
      fundamentals: comb.members,
      samplesPerLinewidth,
      gouyRad: measuredGouy ?? predictedGouy,
      linewidthFsr,
      toleranceFsr,
      model,
      orders,
    }),
  ]
  const misalignmentShare = orders['1'] ?? 0
  const mismatchShare = orders['2'] ?? 0
  const chi = measured.filter((m) => m.fitted).map((m) => m.reducedChiSquare)
  const fsrHz = model.fsrHz
  return {
    fundamentalFraction,
    fundamentalFractionError: Number.isFinite(variance) ? Math.sqrt(variance) : null,
    fsr: {
      seconds: calibration?.fsrSeconds ?? null,
      hz: fsrHz,
      meanSpacingSeconds: calibration?.meanSpacingSeconds ?? null,
      spacingRangeSeconds: calibration?.spacingRangeSeconds ?? null,
    },
    finesse: finesse?.value ?? null,
    finesseError: finesse?.error ?? null,
    linewidthHz: finesse?.value ? fsrHz / finesse.value : null,
    orders,
    misalignmentShare,
    mismatchShare,
    reading: readingOfShares(fundamentalFraction, misalignmentShare, mismatchShare),
    measure: useHeight ? 'height' : 'area',
    measureReason: useHeight
      ? `Fitted heights (${usedModel}): the resonances are well sampled (${fmt(samplesPerLinewidth)} samples per linewidth) and smooth, and all share the cavity linewidth.`
      : `Integrated power (area): ${fastStructure ? 'fast structure inside the resonances' : samplesPerLinewidth < 5 ? `only ${fmt(samplesPerLinewidth)} samples per linewidth` : 'the fits did not all converge'} makes heights unreliable.`,
    gouy: { predictedOneWayRad: predictedGouy, measuredOneWayRad: measuredGouy },
    peaks,
    sweep: {
      direction,
      rampDirection: sweep.rampDirection,
      startTime: timeAt(sweep.startIndex),
      endTime: timeAt(sweep.endIndex - 1),
      evidence: sweep.evidence,
    },
    calibration: {
      polynomialOrder: calibration?.polynomialOrder ?? 0,
      residualRmsFsr: calibration?.residualRmsFsr ?? null,
      fundamentalCount: comb.members.length,
    },
    fitQuality: {
      medianReducedChiSquare: chi.length ? median(chi) : null,
      fittedCount: chi.length,
      peakCount: measured.length,
      orderResidualRmsFsr: orderResidual,
    },
    samplesPerLinewidth: Number.isFinite(samplesPerLinewidth) ? samplesPerLinewidth : null,
    noise: { sigmaV, darkLevelV },
    channels: { transmission: channels.transmission.name, ramp: channels.ramp?.name ?? null },
    warnings,
  }
}

function finesseOf(
  members: number[],
  measured: MeasuredResonance[],
  calibration: SweepCalibration,
  dt: number,
  tOf: (m: MeasuredResonance) => number,
): { value: number; error: number | null } {
  // Finesse = FSR / FWHM, each FWHM taken through the local sweep rate (common practice).
  const values = members.map((k) => 1 / (measured[k].fwhmSamples * dt * Math.abs(sweepRateAt(calibration, tOf(measured[k])))))
  const value = median(values)
  const spread = values.length > 2 ? (1.4826 * median(values.map((v) => Math.abs(v - value)))) / Math.sqrt(values.length) : null
  return { value, error: spread }
}

function areaInFsr(m: MeasuredResonance, calibration: SweepCalibration | null, dt: number, tOf: (m: MeasuredResonance) => number): number {
  const rate = calibration ? Math.abs(sweepRateAt(calibration, tOf(m))) : 1
  return m.areaVSamples * dt * rate
}

function orientedFraction(positionFsr: number, direction: 'up' | 'down' | 'unknown'): number {
  return direction === 'down' ? frac(-positionFsr) : frac(positionFsr)
}

function indexRange(trace: Trace, part: { startTime: number; endTime: number }): { startIndex: number; endIndex: number } {
  if (!(part.endTime > part.startTime)) {
    throw new EngineError('invalid_sweep_part', `sweepPart.endTime (${part.endTime}) must be after startTime (${part.startTime})`)
  }
  return {
    startIndex: Math.ceil((part.startTime - trace.startTime) / trace.sampleInterval),
    endIndex: Math.floor((part.endTime - trace.startTime) / trace.sampleInterval) + 1,
  }
}

function assertVaries(values: Float64Array): void {
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

function median(values: number[]): number {
  if (values.length === 0) return NaN
  const s = values.slice().sort((a, b) => a - b)
  const m = s.length >> 1
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2
}

function frac(x: number): number {
  return x - Math.floor(x)
}

function fmt(x: number): string {
  return Number.isFinite(x) ? x.toFixed(1) : 'n/a'
}

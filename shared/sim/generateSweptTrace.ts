import { computeCavityModel, transverseOffsetFsr } from '../cavity'
import { assertSimOption, isNumberIn } from './assertSimOption'
import { cavityRingingCorrection } from './cavityRingingCorrection'
import { createRandom, type SeededRandom } from './createRandom'
import { createSweepModel, type SweepModel } from './createSweepModel'
import type { SimulatedPeakTruth, SweptTrace, SweptTraceOptions } from './types'

/** Ramp-monitor voltage at the bottom and top of the piezo drive (a divided-down monitor output). */
const RAMP_LOW_V = 0
const RAMP_HIGH_V = 5
/** White noise on the ramp-monitor channel, volts rms. */
const RAMP_NOISE_V = 0.002
/** Quantisation full scale reaches this fraction of the signal's span beyond its extremes. */
const FULL_SCALE_MARGIN = 0.02
/** Default decay time of the detector ringing, in periods of the ringing. */
const DEFAULT_RING_DECAY_PERIODS = 1.5

/** One family of resonances (an order, one of its split sub-peaks, or a sideband of either). */
interface ModeFamily {
  order: number
  kind: 'carrier' | 'sideband'
  offsetFsr: number
  heightV: number
  power: number
}

/**
 * Synthetic swept-cavity transmission trace with its truth. Each transverse order N resonates N·ψ/π FSR (mod 1)
 * above TEM00 (Kogelnik & Li, Appl. Opt. 5, 1550 (1966); Siegman, "Lasers" (1986), ch. 19) and transmits an
 * Airy function 1/(1 + (2𝓕/π)² sin²(πx)) of the detuning x in FSR units (Born & Wolf, "Principles of Optics", §7.6),
 * whose area per FSR, 1/√(1 + (2𝓕/π)²), is the same for every order: peak heights scale with order powers.
 * Then: slow drift, detector single-pole low-pass, detector ringing (an under-damped second-order response of unit
 * DC gain, `detectorRingHz` and `detectorRingDecaySeconds`), white Gaussian noise, quantisation.
 */
export function generateSweptTrace(options: SweptTraceOptions): SweptTrace {
  const {
    cavity,
    finesse,
    orderPowers,
    sampleCount,
    fsrCount,
    sweepFractionOfRecord = 0.9,
    direction = 'up',
    rampShape = 'sawtooth',
    nonlinearity = 0,
    sampleIntervalSeconds = 1e-5,
    startTimeSeconds = -(sampleCount / 2) * sampleIntervalSeconds,
    peakHeightV = 1,
    noiseFraction = 0.003,
    quantizationBits,
    darkOffsetV = 0.01,
    driftFraction = 0,
    lowPassTauSeconds = 0,
    detectorRingHz = 0,
    detectorRingDecaySeconds = DEFAULT_RING_DECAY_PERIODS / detectorRingHz,
    modulationMHz,
    sidebandPowerFraction = modulationMHz === undefined ? 0 : 0.05,
    astigmatismSplitFsr = 0,
    ringing = false,
    ditherAmplitudeFsr = 0,
    ditherFrequencyHz = 0,
    includeRamp = true,
    seed = 1,
  } = options
  assertOptions(options)

  const model = cavity === undefined ? null : computeCavityModel(cavity)
  const gouyOneWayRad = model === null ? options.gouyOneWayRad : model.gouyOneWayRad
  const fsrHz = model === null ? (options.fsrHz ?? null) : model.fsrHz
  assertSimOption(
    modulationMHz === undefined || fsrHz !== null,
    'modulationMHz needs the FSR in Hz: give `cavity` or `fsrHz` as well',
  )
  assertSimOption(!ringing || fsrHz !== null, 'ringing needs the FSR in Hz: give `cavity` or `fsrHz` as well')

  const random = createRandom(seed)
  const startDetuningFsr = options.startDetuningFsr ?? random.uniform()
  const driftPhase = 2 * Math.PI * random.uniform()

  const totalPower = orderPowers.reduce((sum, p) => sum + p, 0)
  const orderShares = orderPowers.map((p) => p / totalPower)
  // Heights follow shares because every order has the same Airy area; TEM00 gets peakHeightV.
  const referenceShare = orderShares[0] > 0 ? orderShares[0] : Math.max(...orderShares)
  const voltsPerShare = peakHeightV / referenceShare
  const sidebandOffsetFsr = modulationMHz === undefined || fsrHz === null ? 0 : (modulationMHz * 1e6) / fsrHz
  const families = buildFamilies(orderShares, gouyOneWayRad, voltsPerShare, astigmatismSplitFsr, sidebandOffsetFsr, sidebandPowerFraction)

  const recordSeconds = sampleCount * sampleIntervalSeconds
  const sweep = createSweepModel({
    startTimeSeconds,
    recordSeconds,
    sweepFractionOfRecord,
    rampShape,
    direction,
    fsrCount,
    startDetuningFsr,
    nonlinearity,
    ditherAmplitudeFsr,
    ditherFrequencyHz,
  })

  const { tSeconds, detuningFsr, cosDetuning, sinDetuning, rampV } = sampleSweep(
    sweep,
    sampleCount,
    startTimeSeconds,
    sampleIntervalSeconds,
    includeRamp,
  )

  const coefficientOfFinesse = ((2 * finesse) / Math.PI) ** 2
  const opticalV = new Float64Array(sampleCount)
  for (const family of families) {
    addAiryFamily(opticalV, cosDetuning, sinDetuning, family.offsetFsr, family.heightV, coefficientOfFinesse)
  }

  if (ringing && fsrHz !== null) {
    for (const family of families) {
      const segments = cavityRingingCorrection({
        detuningFsr,
        detuningAt: sweep.detuningFsr,
        startTimeSeconds,
        sampleIntervalSeconds,
        fsrHz,
        finesse,
        offsetFsr: family.offsetFsr,
        heightV: family.heightV,
      })
      for (const { startIndex, deltaV } of segments) {
        for (let j = 0; j < deltaV.length; j++) opticalV[startIndex + j] += deltaV[j]
      }
    }
  }

  const transmissionV = opticalV
  if (driftFraction > 0) applyDrift(transmissionV, driftFraction, driftPhase)
  if (lowPassTauSeconds > 0) applyLowPass(transmissionV, sampleIntervalSeconds / lowPassTauSeconds)
  if (detectorRingHz > 0) applyDetectorRinging(transmissionV, sampleIntervalSeconds, detectorRingHz, detectorRingDecaySeconds)
  for (let i = 0; i < sampleCount; i++) transmissionV[i] += darkOffsetV
  addGaussianNoise(transmissionV, noiseFraction * peakHeightV, random)
  if (rampV) addGaussianNoise(rampV, RAMP_NOISE_V, random)
  if (quantizationBits !== undefined) {
    quantize(transmissionV, quantizationBits)
    if (rampV) quantize(rampV, quantizationBits)
  }

  const peaks = listPeaks(families, sweep.timeOfDetuning, startDetuningFsr, fsrCount, direction)
  // Mean TEM00 spacing as a perfect analysis would measure it: (last − first)/(count − 1) of the sweep's TEM00 peaks.
  // With a nonlinear piezo it differs from the sweep-wide mean, which is kept separately.
  const sweepMeanFsrSeconds = (sweepFractionOfRecord * recordSeconds) / fsrCount
  const fundamentalTimes = peaks.filter((p) => p.order === 0 && p.kind === 'carrier').map((p) => p.t)
  const fsrSeconds =
    fundamentalTimes.length >= 2
      ? (fundamentalTimes[fundamentalTimes.length - 1] - fundamentalTimes[0]) / (fundamentalTimes.length - 1)
      : sweepMeanFsrSeconds
  return {
    tSeconds,
    transmissionV,
    rampV,
    sampleIntervalSeconds,
    truth: {
      fundamentalFraction: orderShares[0],
      orderShares,
      fsrSeconds,
      sweepMeanFsrSeconds,
      fsrHz,
      finesse,
      gouyOneWayRad,
      samplesPerLinewidth: sweepMeanFsrSeconds / finesse / sampleIntervalSeconds,
      direction,
      sweepStartSeconds: sweep.sweepStartSeconds,
      sweepEndSeconds: sweep.sweepEndSeconds,
      peaks,
    },
  }
}

/** Samples time, detuning (with its cos/sin of 2πx) and the ramp-monitor voltage. */
function sampleSweep(
  sweep: SweepModel,
  sampleCount: number,
  startTimeSeconds: number,
  sampleIntervalSeconds: number,
  includeRamp: boolean,
): { tSeconds: Float64Array; detuningFsr: Float64Array; cosDetuning: Float64Array; sinDetuning: Float64Array; rampV: Float64Array | null } {
  const tSeconds = new Float64Array(sampleCount)
  const detuningFsr = new Float64Array(sampleCount)
  const cosDetuning = new Float64Array(sampleCount)
  const sinDetuning = new Float64Array(sampleCount)
  const rampV = includeRamp ? new Float64Array(sampleCount) : null
  const rampSpanV = RAMP_HIGH_V - RAMP_LOW_V
  for (let i = 0; i < sampleCount; i++) {
    const t = startTimeSeconds + i * sampleIntervalSeconds
    tSeconds[i] = t
    const x = sweep.detuningFsr(t)
    detuningFsr[i] = x
    // Fold before the trigonometry so that large detunings keep full precision.
    const phase = 2 * Math.PI * (x - Math.floor(x))
    cosDetuning[i] = Math.cos(phase)
    sinDetuning[i] = Math.sin(phase)
  }
  if (rampV) for (let i = 0; i < sampleCount; i++) rampV[i] = RAMP_LOW_V + rampSpanV * sweep.rampPosition(tSeconds[i])
  return { tSeconds, detuningFsr, cosDetuning, sinDetuning, rampV }
}

/** Adds one family's Airy peaks; sin²(π(x − o)) = (1 − cos 2πx cos 2πo − sin 2πx sin 2πo)/2 reuses one cos/sin pair per sample. */
function addAiryFamily(
  out: Float64Array,
  cosDetuning: Float64Array,
  sinDetuning: Float64Array,
  offsetFsr: number,
  heightV: number,
  coefficientOfFinesse: number,
): void {
  const cosOffset = Math.cos(2 * Math.PI * offsetFsr)
  const sinOffset = Math.sin(2 * Math.PI * offsetFsr)
  const half = coefficientOfFinesse / 2
  const n = out.length
  for (let i = 0; i < n; i++) {
    out[i] += heightV / (1 + half * (1 - cosDetuning[i] * cosOffset - sinDetuning[i] * sinOffset))
  }
}

/** Slow input-power drift: a tilt plus one slow wiggle, bounded by ±driftFraction. */
function applyDrift(values: Float64Array, driftFraction: number, phase: number): void {
  const n = values.length
  for (let i = 0; i < n; i++) {
    const u = i / n
    values[i] *= 1 + driftFraction * (0.6 * (2 * u - 1) + 0.4 * Math.sin(2 * Math.PI * 1.7 * u + phase))
  }
}

/** Single-pole RC low-pass, discretised exactly for a piecewise-constant input (common practice). */
function applyLowPass(values: Float64Array, samplesPerTau: number): void {
  const alpha = 1 - Math.exp(-samplesPerTau)
  for (let i = 1; i < values.length; i++) values[i] = values[i - 1] + alpha * (values[i] - values[i - 1])
}

/**
 * Under-damped second-order low-pass of unit DC gain, ÿ + 2σẏ + ω0²y = ω0²u (Ogata, "Modern Control Engineering",
 * ch. 5): impulse response (ω0²/ω_d)·e^(−σt)·sin(ω_d t) with ω_d = 2πf_r, σ = 1/τ, ω0² = ω_d² + σ² (damping ζ = σ/ω0).
 * Exact for an input linear between samples: the forced solution for u = u0 + m·t is y = u − m·2σ/ω0², ẏ = m, and the
 * deviation from it evolves freely by the transition matrix Φ = e^(AT). A constant input is a fixed point, so the
 * DC gain is exactly 1 and peak areas are kept. Starts at rest on the first sample.
 */
function applyDetectorRinging(values: Float64Array, sampleIntervalSeconds: number, ringHz: number, decaySeconds: number): void {
  const omegaD = 2 * Math.PI * ringHz
  const sigma = 1 / decaySeconds
  const omega0Squared = omegaD * omegaD + sigma * sigma
  const lagSeconds = (2 * sigma) / omega0Squared
  // Φ for the state (y, ẏ) over one sample interval.
  const decay = Math.exp(-sigma * sampleIntervalSeconds)
  const c = Math.cos(omegaD * sampleIntervalSeconds)
  const s = Math.sin(omegaD * sampleIntervalSeconds)
  const phiYY = decay * (c + (sigma / omegaD) * s)
  const phiYV = (decay * s) / omegaD
  const phiVY = (-decay * omega0Squared * s) / omegaD
  const phiVV = decay * (c - (sigma / omegaD) * s)
  let y = values[0]
  let v = 0
  let previousInput = values[0]
  for (let i = 1; i < values.length; i++) {
    const input = values[i]
    const slope = (input - previousInput) / sampleIntervalSeconds
    // Deviation from the forced solution at the start of the interval, carried across it by Φ.
    const dy = y - (previousInput - slope * lagSeconds)
    const dv = v - slope
    y = input - slope * lagSeconds + phiYY * dy + phiYV * dv
    v = slope + phiVY * dy + phiVV * dv
    previousInput = input
    values[i] = y
  }
}

/** Adds white Gaussian noise of rms `sigma` (Box–Muller pairs, Box & Muller, Ann. Math. Stat. 29, 610 (1958)). */
function addGaussianNoise(values: Float64Array, sigma: number, random: SeededRandom): void {
  if (sigma <= 0) return
  const n = values.length
  for (let i = 0; i < n; i += 2) {
    const radius = sigma * Math.sqrt(-2 * Math.log(1 - random.uniform()))
    const angle = 2 * Math.PI * random.uniform()
    values[i] += radius * Math.cos(angle)
    if (i + 1 < n) values[i + 1] += radius * Math.sin(angle)
  }
}

/** Carrier families (split into N + 1 sub-peaks when astigmatic) and their first-order sidebands. */
function buildFamilies(
  orderShares: number[],
  gouyOneWayRad: number,
  voltsPerShare: number,
  splitFsr: number,
  sidebandOffsetFsr: number,
  sidebandPowerFraction: number,
): ModeFamily[] {
  const families: ModeFamily[] = []
  orderShares.forEach((share, order) => {
    if (share <= 0) return
    const base = transverseOffsetFsr(order, gouyOneWayRad)
    const parts = splitFsr > 0 && order > 0 ? order + 1 : 1
    for (let part = 0; part < parts; part++) {
      // HG_mn with m − n = 2·part − N sits (m − n)·Δ/2 from the order's mean place.
      const spread = parts > 1 ? splitFsr * (part - order / 2) : 0
      const power = share / parts
      const carrier: ModeFamily = { order, kind: 'carrier', offsetFsr: base + spread, heightV: voltsPerShare * power, power }
      families.push(carrier)
      if (sidebandOffsetFsr > 0 && sidebandPowerFraction > 0) {
        for (const sign of [-1, 1]) {
          families.push({
            order,
            kind: 'sideband',
            offsetFsr: carrier.offsetFsr + sign * sidebandOffsetFsr,
            heightV: carrier.heightV * sidebandPowerFraction,
            power: carrier.power * sidebandPowerFraction,
          })
        }
      }
    }
  })
  return families
}

/** Truth: every resonance centre of the main sweep (undithered detuning = offset + integer), in time order. */
function listPeaks(
  families: ModeFamily[],
  timeOfDetuning: (detuningFsr: number) => number | null,
  startDetuningFsr: number,
  fsrCount: number,
  direction: 'up' | 'down',
): SimulatedPeakTruth[] {
  const low = direction === 'up' ? startDetuningFsr : startDetuningFsr - fsrCount
  const high = low + fsrCount
  const peaks: SimulatedPeakTruth[] = []
  for (const family of families) {
    for (let m = Math.ceil(low - family.offsetFsr); m + family.offsetFsr <= high; m++) {
      const t = timeOfDetuning(m + family.offsetFsr)
      if (t === null) continue
      // Local time per FSR: the inverse sweep rate at the peak, by a central difference of the sweep model.
      const before = timeOfDetuning(m + family.offsetFsr - 1e-3)
      const after = timeOfDetuning(m + family.offsetFsr + 1e-3)
      const fsrSecondsHere = before !== null && after !== null ? Math.abs(after - before) / 2e-3 : null
      peaks.push({ t, order: family.order, kind: family.kind, power: family.power, heightV: family.heightV, fsrSecondsHere })
    }
  }
  return peaks.sort((a, b) => a.t - b.t)
}

/** Rounds to 2^bits levels spread over a full scale just wider than the signal (a digitiser set up by hand). */
function quantize(values: Float64Array, bits: number): void {
  let min = Infinity
  let max = -Infinity
  for (let i = 0; i < values.length; i++) {
    const v = values[i]
    if (v < min) min = v
    if (v > max) max = v
  }
  const span = max - min || 1
  const low = min - FULL_SCALE_MARGIN * span
  const step = ((1 + 2 * FULL_SCALE_MARGIN) * span) / (2 ** bits - 1)
  const inverseStep = 1 / step
  for (let i = 0; i < values.length; i++) values[i] = low + Math.round((values[i] - low) * inverseStep) * step
}

function assertOptions(options: SweptTraceOptions): void {
  const o = options
  assertSimOption(typeof o === 'object' && o !== null, 'options must be an object')
  if (o.cavity === undefined) {
    assertSimOption(
      isNumberIn(o.gouyOneWayRad, 0, Math.PI) && o.gouyOneWayRad > 0 && o.gouyOneWayRad < Math.PI,
      `gouyOneWayRad must be a number strictly between 0 and π, got ${String(o.gouyOneWayRad)}`,
    )
  }
  assertSimOption(isNumberIn(o.finesse, 1, 1e7) && o.finesse > 1, `finesse must be a number above 1 and at most 1e7, got ${String(o.finesse)}`)
  assertSimOption(
    Array.isArray(o.orderPowers) && o.orderPowers.length >= 1 && o.orderPowers.length <= 50,
    'orderPowers must be an array of 1 to 50 relative powers (index = transverse order)',
  )
  assertSimOption(
    o.orderPowers.every((p) => isNumberIn(p, 0, Number.MAX_VALUE)),
    `orderPowers must hold finite numbers ≥ 0, got [${o.orderPowers.join(', ')}]`,
  )
  assertSimOption(o.orderPowers.some((p) => p > 0), 'orderPowers must have at least one order with power above 0')
  assertSimOption(
    Number.isInteger(o.sampleCount) && o.sampleCount >= 16 && o.sampleCount <= 20_000_000,
    `sampleCount must be an integer from 16 to 20,000,000, got ${String(o.sampleCount)}`,
  )
  assertSimOption(isNumberIn(o.fsrCount, 0, 1000) && o.fsrCount > 0, `fsrCount must be a number above 0 and at most 1000, got ${String(o.fsrCount)}`)
  const optional: [keyof SweptTraceOptions, number, number][] = [
    ['fsrHz', 1, 1e15],
    ['sweepFractionOfRecord', 0.01, 1],
    ['nonlinearity', -0.9, 0.9],
    ['sampleIntervalSeconds', 1e-15, 1e3],
    ['startTimeSeconds', -1e9, 1e9],
    ['startDetuningFsr', -1e6, 1e6],
    ['peakHeightV', 1e-12, 1e6],
    ['noiseFraction', 0, 10],
    ['quantizationBits', 1, 24],
    ['darkOffsetV', -1e6, 1e6],
    ['driftFraction', 0, 0.9],
    ['lowPassTauSeconds', 0, 1e3],
    ['detectorRingHz', 0, 1e15],
    ['modulationMHz', 1e-9, 1e9],
    ['sidebandPowerFraction', 0, 100],
    ['astigmatismSplitFsr', 0, 0.5],
    ['ditherAmplitudeFsr', 0, 10],
    ['ditherFrequencyHz', 0, 1e15],
    ['seed', -(2 ** 53), 2 ** 53],
  ]
  for (const [name, min, max] of optional) {
    const value = o[name]
    assertSimOption(value === undefined || isNumberIn(value, min, max), `${name} must be a number from ${min} to ${max}, got ${String(value)}`)
  }
  const nyquistHz = 1 / (2 * (o.sampleIntervalSeconds ?? 1e-5))
  assertSimOption(
    o.detectorRingHz === undefined || o.detectorRingHz < nyquistHz,
    `detectorRingHz must be below the Nyquist frequency 1/(2·sampleIntervalSeconds) = ${Number(nyquistHz.toPrecision(12))} Hz, got ${String(o.detectorRingHz)}`,
  )
  assertSimOption(
    o.detectorRingDecaySeconds === undefined || (isNumberIn(o.detectorRingDecaySeconds, 0, 1e3) && o.detectorRingDecaySeconds > 0),
    `detectorRingDecaySeconds must be a number above 0 and at most 1000, got ${String(o.detectorRingDecaySeconds)}`,
  )
  assertSimOption(
    o.quantizationBits === undefined || Number.isInteger(o.quantizationBits),
    `quantizationBits must be an integer, got ${String(o.quantizationBits)}`,
  )
  assertSimOption(
    o.direction === undefined || o.direction === 'up' || o.direction === 'down',
    `direction must be 'up' or 'down', got ${String(o.direction)}`,
  )
  assertSimOption(
    o.rampShape === undefined || o.rampShape === 'sawtooth' || o.rampShape === 'triangle',
    `rampShape must be 'sawtooth' or 'triangle', got ${String(o.rampShape)}`,
  )
}

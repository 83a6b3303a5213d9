import type { SweptTraceOptions } from '../../../shared/sim'

/**
 * The accuracy suite's 60 generated cases, spanning what the brief asks for: 2,500 to 2,000,000 samples,
 * finesse 50 to 3,000, 3 to 200 samples per linewidth, noise 0.1 % to 3 %, piezo nonlinearity up to ±15 %,
 * both sweep directions, with and without a ramp channel and with and without phase-modulation sidebands.
 *
 * Samples per linewidth are set, not left to chance: the generator's linewidth in samples is
 * 0.9·N / (fsrCount·𝓕) (its `truth.samplesPerLinewidth`). Each case takes a target spread log-evenly over the
 * range its record length allows, then the number of FSRs swept (2.5 … 15) and, when needed, the finesse are
 * chosen to hit it.
 */
export const CASE_COUNT = 60

const cavities = [
  { wavelengthNm: 1064, lengthMm: 100, roc1Mm: null, roc2Mm: 500 },
  { wavelengthNm: 780, lengthMm: 200, roc1Mm: 1000, roc2Mm: 1000 },
  { wavelengthNm: 532, lengthMm: 75, roc1Mm: 250, roc2Mm: null },
]
/** Relative power per order (index = order); the last set puts 0.5 % in order 3 to test the labelling floor. */
const orderPowerSets = [
  [0.9, 0.05, 0.03, 0.02],
  [0.75, 0.12, 0.1, 0.03],
  [0.6, 0.2, 0.12, 0.05, 0.03],
  [0.95, 0.03, 0.02],
  [0.97, 0.015, 0.01, 0.005],
]
const SAMPLE_COUNTS = [2500, 5000, 10_000, 20_000, 50_000, 100_000, 200_000, 500_000, 1_000_000, 2_000_000]
const FINESSES = [50, 100, 150, 300, 600, 1000, 2000, 3000]
const NOISE = [0.001, 0.003, 0.01, 0.03]
const NONLINEARITY = [0, 0.05, -0.1, 0.15, -0.15, 0.1, -0.05]
const SWEEP_FRACTION = 0.9
const MIN_FSR = 2.5
const MAX_FSR = 15

/** Linewidth in samples for a sweep of `fsrCount` FSRs over 90 % of `sampleCount` samples. */
export function samplesPerLinewidthOf(sampleCount: number, finesse: number, fsrCount: number): number {
  return (SWEEP_FRACTION * sampleCount) / (fsrCount * finesse)
}

/**
 * Finesse and FSR count that give `targetSpl` samples per linewidth: keep the target and move the finesse to the
 * nearest value of the list (in ratio) that allows 2.5…15 FSRs; only when none does, move the target.
 */
function fitSweep(sampleCount: number, finesse: number, targetSpl: number): { finesse: number; fsrCount: number } {
  const sweepSamples = SWEEP_FRACTION * sampleCount
  const fsrFor = (f: number, spl: number) => sweepSamples / (f * spl)
  const byCloseness = FINESSES.slice().sort((a, b) => Math.abs(Math.log(a / finesse)) - Math.abs(Math.log(b / finesse)))
  const keeping = byCloseness.find((f) => fsrFor(f, targetSpl) >= MIN_FSR && fsrFor(f, targetSpl) <= MAX_FSR)
  if (keeping !== undefined) return { finesse: keeping, fsrCount: fsrFor(keeping, targetSpl) }
  for (const f of byCloseness) {
    const lo = Math.max(3, sweepSamples / (f * MAX_FSR))
    const hi = Math.min(200, sweepSamples / (f * MIN_FSR))
    if (lo <= hi) return { finesse: f, fsrCount: fsrFor(f, Math.min(hi, Math.max(lo, targetSpl))) }
  }
  throw new Error(`no sweep fits ${sampleCount} samples`)
}

/** Options of case k (0 ≤ k < CASE_COUNT); deterministic. */
export function accuracyCase(k: number): SweptTraceOptions {
  const sampleCount = SAMPLE_COUNTS[k % SAMPLE_COUNTS.length]
  // Target samples per linewidth: spread log-evenly over what this record length allows (3…200 at most).
  const lowest = Math.max(3, (SWEEP_FRACTION * sampleCount) / (FINESSES[FINESSES.length - 1] * MAX_FSR))
  const highest = Math.min(200, (SWEEP_FRACTION * sampleCount) / (FINESSES[0] * MIN_FSR))
  const targetSpl = lowest * (highest / lowest) ** (((k * 7) % 11) / 10)
  const { finesse, fsrCount } = fitSweep(sampleCount, FINESSES[(k * 3) % FINESSES.length], targetSpl)
  const sidebands = k % 4 === 1
  return {
    gouyOneWayRad: 0,
    cavity: cavities[k % cavities.length],
    finesse,
    orderPowers: orderPowerSets[(k >> 1) % orderPowerSets.length],
    sampleCount,
    fsrCount,
    sweepFractionOfRecord: SWEEP_FRACTION,
    direction: k % 2 ? 'down' : 'up',
    rampShape: k % 5 === 2 ? 'triangle' : 'sawtooth',
    nonlinearity: NONLINEARITY[k % NONLINEARITY.length],
    noiseFraction: NOISE[(k >> 2) % NOISE.length],
    quantizationBits: k % 3 === 0 ? 8 : undefined,
    includeRamp: k % 4 !== 3,
    modulationMHz: sidebands ? 7 + (k % 5) : undefined,
    seed: 100 + k,
  }
}

import { analyzeTrace } from '../../../shared/analysis/analyzeTrace'
import { generateSweptTrace, type SweptTraceOptions } from '../../../shared/sim'
import { traceFromSim } from '../analysis/traceFromSim'

/** One case's figures against the generator's truth. */
export interface CaseOutcome {
  row: string
  samplesPerLinewidth: number
  /** |found − true| TEM00 fraction, percentage points (NaN when the analysis threw). */
  fractionErrorPoints: number
  failures: string[]
}

/** Criteria from the brief (issue 5, "Done when"). */
export const CRITERIA = {
  /** Median / worst TEM00-fraction error on cases with at least this many samples per linewidth. */
  wellSampled: 5,
  medianPoints: 0.5,
  worstPoints: 2,
  /** Every order holding at least this share must be labelled. */
  labelShare: 0.005,
  fsrRelative: 0.001,
  finesseRelative: 0.05,
}

export const TABLE_HEADER = [
  '| case | samples | finesse | samples/linewidth | noise | nonlinearity | direction | ramp | sidebands MHz | truth f0 | found f0 | error (points) | FSR error % | finesse error % | missed orders | measure | warnings |',
  '|---|---|---|---|---|---|---|---|---|---|---|---|---|---|---|---|---|',
]

/**
 * Generates case `k`, analyses it and checks the brief's criteria. The FSR is compared like with like: the mean
 * spacing the analysis reports runs from its first to its last TEM00 resonance, so the truth is taken over the
 * same two resonances (on a nonlinear sweep the mean spacing depends on which resonances it spans).
 */
export function evaluateCase(k: number, options: SweptTraceOptions): CaseOutcome {
  const sim = generateSweptTrace(options)
  const truth = sim.truth
  const spl = truth.samplesPerLinewidth
  const geometry = { ...options.cavity!, modulationMHz: options.modulationMHz }
  const failures: string[] = []
  let row = `| ${k} | ${options.sampleCount} | ${options.finesse} | ${spl.toFixed(1)} | ${options.noiseFraction} | ${options.nonlinearity} | ${truth.direction} | ${options.includeRamp ? 'yes' : 'no'} | ${options.modulationMHz ?? '-'} |`
  let fError = NaN
  try {
    const r = analyzeTrace(traceFromSim(sim), geometry)
    fError = 100 * Math.abs(r.fundamentalFraction - truth.fundamentalFraction)
    const fsrError = fsrErrorOf(r.calibration.fundamentalTimes, r.fsr.meanSpacingSeconds, truth.peaks)
    const finesseError = r.finesse ? Math.abs(r.finesse / truth.finesse - 1) : NaN
    const missing = truth.orderShares
      .map((share, order) => ({ share, order }))
      .filter((o) => o.share >= CRITERIA.labelShare && !((r.orders[String(o.order)] ?? 0) > 0))
      .map((o) => o.order)
    if (spl >= CRITERIA.wellSampled && !(fError <= CRITERIA.worstPoints)) failures.push(`case ${k}: TEM00 fraction off by ${fError.toFixed(2)} points`)
    if (missing.length) failures.push(`case ${k}: orders ${missing.join(',')} not labelled`)
    if (!(fsrError <= CRITERIA.fsrRelative)) failures.push(`case ${k}: FSR off by ${(100 * fsrError).toFixed(3)} %`)
    if (!(finesseError <= CRITERIA.finesseRelative)) failures.push(`case ${k}: finesse off by ${(100 * finesseError).toFixed(1)} %`)
    row += ` ${truth.fundamentalFraction.toFixed(4)} | ${r.fundamentalFraction.toFixed(4)} | ${fError.toFixed(2)} | ${(100 * fsrError).toFixed(3)} | ${(100 * finesseError).toFixed(1)} | ${missing.join(',') || '-'} | ${r.measure} | ${r.warnings.map((w) => w.code).join(' ')} |`
  } catch (error) {
    failures.push(`case ${k}: ${(error as Error).message}`)
    row += ` ${truth.fundamentalFraction.toFixed(4)} | error | | | | | | ${(error as Error).message} |`
  }
  return { row, samplesPerLinewidth: spl, fractionErrorPoints: fError, failures }
}

/** Relative error of the mean TEM00 spacing against the truth over the same first and last TEM00 resonance. */
function fsrErrorOf(times: number[], meanSpacing: number | null, peaks: { t: number; order: number; kind: string }[]): number {
  if (times.length < 2 || meanSpacing === null) return NaN
  const truthTimes = peaks.filter((p) => p.order === 0 && p.kind === 'carrier').map((p) => p.t)
  const nearest = (t: number) => truthTimes.reduce((best, u, i) => (Math.abs(u - t) < Math.abs(truthTimes[best] - t) ? i : best), 0)
  const first = nearest(times[0])
  const last = nearest(times[times.length - 1])
  if (last === first) return NaN
  const truthMean = (truthTimes[last] - truthTimes[first]) / (last - first)
  return Math.abs(Math.abs(meanSpacing) / Math.abs(truthMean) - 1)
}

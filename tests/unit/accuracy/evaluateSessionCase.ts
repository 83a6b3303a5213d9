import { analyzeTrace } from '../../../shared/analysis/analyzeTrace'
import type { AnalysisResult } from '../../../shared/analysis/types'
import { generateSweptTrace, type SimulatedPeakTruth } from '../../../shared/sim'
import { traceFromSim } from '../analysis/traceFromSim'
import { FRACTION_BANDS, type SessionCase } from './sessionCases'

/** One tuning-session case against its truth. */
export interface SessionOutcome {
  k: number
  effect: SessionCase['effect']
  truthFraction: number
  /** TEM00 resonances of the truth inside the main sweep. */
  truthTem00Count: number
  /** Null when the analysis refused the trace (its error code in `refusal`). */
  foundFraction: number | null
  refusal: string | null
  /** |found − true|, percentage points (NaN when refused). */
  errorPoints: number
  /** Relative error of the FSR in seconds against the truth's mean TEM00 spacing (NaN without a value). */
  fsrError: number
  finesseError: number
  /** Labels standing where the truth has no line of that order (carrier peaks with an order that no true line explains). */
  labelsOnNothing: number
  /** Labels on a real line of another order. */
  mislabels: number
  /** Resonances labelled with an order ≥ 1 (the ones that measure the Gouy phase). */
  transverseLabels: number
  warnings: string[]
  /** Length the result says the data implies, mm (null when it says none). */
  impliedLengthMm: number | null
  row: string
}

/** Generates, analyses and scores one session case. */
export function evaluateSessionCase(k: number, c: SessionCase): SessionOutcome {
  const sim = generateSweptTrace(c.options)
  const truth = sim.truth
  let result: AnalysisResult | null = null
  let refusal: string | null = null
  try {
    result = analyzeTrace(traceFromSim(sim), c.enteredCavity)
  } catch (error) {
    refusal = (error as { code?: string }).code ?? (error as Error).message
  }
  const found = result?.fundamentalFraction ?? null
  const errorPoints = found === null ? NaN : 100 * Math.abs(found - truth.fundamentalFraction)
  const fsrError = result ? fsrErrorOf(result, truth.peaks) : NaN
  const finesseError = result?.finesse ? Math.abs(result.finesse / truth.finesse - 1) : NaN
  const linewidthSeconds = truth.sweepMeanFsrSeconds / truth.finesse
  // A label on a real line of another order (orders that share a place, or a wrong reading) is a mislabel; a label
  // where the truth has no line at all is a label on nothing.
  const near = (p: { t: number }, t: SimulatedPeakTruth) => Math.abs(t.t - p.t) < Math.max(5 * linewidthSeconds, 0.01 * truth.sweepMeanFsrSeconds)
  // Only the main sweep, less 0.02 FSR at each end: the truth lists no resonance crossed during a flyback or past a
  // turn of the ramp, whose flank may reach into the sweep.
  const labelled = result ? result.peaks.filter((p) => p.kind === 'carrier' && p.order !== null && p.t >= truth.sweepStartSeconds + 0.02 * truth.sweepMeanFsrSeconds && p.t <= truth.sweepEndSeconds - 0.02 * truth.sweepMeanFsrSeconds) : []
  const labelsOnNothing = labelled.filter((p) => !truth.peaks.some((t) => near(p, t))).length
  const mislabels = labelled.filter((p) => truth.peaks.some((t) => near(p, t)) && !truth.peaks.some((t) => near(p, t) && t.kind === 'carrier' && t.order === p.order)).length
  const transverseLabels = labelled.filter((p) => (p.order ?? 0) > 0).length
  const warnings = result?.warnings.map((w) => w.code) ?? []
  const implied = result?.warnings.find((w) => w.code === 'geometry_mismatch')?.message.match(/([0-9.]+) mm/)
  const impliedLengthMm = implied ? Number(implied[1]) : null
  const o = c.options
  const row = [
    k,
    c.effect + (c.lengthError ? ` ${c.lengthError > 0 ? '+' : ''}${(100 * c.lengthError).toFixed(0)}%` : ''),
    `ψ/π ${(truth.gouyOneWayRad / Math.PI).toFixed(3)}`,
    o.sampleCount,
    o.finesse,
    o.fsrCount.toFixed(2),
    truth.samplesPerLinewidth.toFixed(1),
    o.includeRamp ? 'ramp' : 'no ramp',
    truth.direction,
    truth.orderShares.map((s) => (100 * s).toFixed(0)).join('/'),
    found === null ? `refused: ${refusal}` : found.toFixed(3),
    Number.isFinite(errorPoints) ? errorPoints.toFixed(2) : '-',
    Number.isFinite(fsrError) ? (100 * fsrError).toFixed(3) : '-',
    Number.isFinite(finesseError) ? (100 * finesseError).toFixed(1) : '-',
    `${labelsOnNothing} / ${mislabels}`,
    warnings.join(' ') || '-',
  ].join(' | ')
  const truthTem00Count = truth.peaks.filter((p) => p.kind === 'carrier' && p.order === 0).length
  return { k, effect: c.effect, truthFraction: truth.fundamentalFraction, truthTem00Count, foundFraction: found, refusal, errorPoints, fsrError, finesseError, labelsOnNothing, mislabels, transverseLabels, warnings, impliedLengthMm, row: `| ${row} |` }
}

/**
 * Relative FSR error on the time axis, like against like: with two or more TEM00 the mean spacing against the truth's
 * over the same first and last TEM00 (a nonlinear sweep makes the mean depend on the span); with one, the local
 * period at it against the sweep model's own (truth `fsrSecondsHere`).
 */
function fsrErrorOf(result: AnalysisResult, peaks: SimulatedPeakTruth[]): number {
  const times = result.calibration.fundamentalTimes
  const truthTimes = peaks.filter((p) => p.order === 0 && p.kind === 'carrier')
  if (times.length === 0 || truthTimes.length === 0) return NaN
  const nearest = (t: number) => truthTimes.reduce((best, u, i) => (Math.abs(u.t - t) < Math.abs(truthTimes[best].t - t) ? i : best), 0)
  if (times.length === 1) {
    const here = truthTimes[nearest(times[0])].fsrSecondsHere
    return here && result.fsr.seconds ? Math.abs(result.fsr.seconds / here - 1) : NaN
  }
  const first = nearest(Math.min(...times))
  const last = nearest(Math.max(...times))
  if (last === first || result.fsr.meanSpacingSeconds === null) return NaN
  const truthMean = (truthTimes[last].t - truthTimes[first].t) / (last - first)
  return Math.abs(Math.abs(result.fsr.meanSpacingSeconds) / truthMean - 1)
}

export const SESSION_TABLE_HEADER = [
  '| case | effect | Gouy | samples | finesse | FSRs | samples/linewidth | ramp | direction | truth shares % | found f0 | error (points) | FSR error % | finesse error % | labels on nothing / on another order’s line | warnings |',
  '|---|---|---|---|---|---|---|---|---|---|---|---|---|---|---|---|',
]

export interface BandFigures {
  band: [number, number]
  count: number
  medianPoints: number
  worstPoints: number
  /** Cases more than 3 points off (or refused) without `ambiguous_reading`. */
  unflagged: SessionOutcome[]
}

export function bandFigures(all: SessionOutcome[]): BandFigures[] {
  return FRACTION_BANDS.map((band, b) => {
    const inBand = all.filter((o) => o.truthFraction >= band[0] && (o.truthFraction < band[1] || (b === FRACTION_BANDS.length - 1 && o.truthFraction <= 1)))
    const errors = inBand.map((o) => (Number.isFinite(o.errorPoints) ? o.errorPoints : Infinity)).sort((x, y) => x - y)
    return {
      band,
      count: inBand.length,
      medianPoints: errors[errors.length >> 1],
      worstPoints: errors[errors.length - 1],
      unflagged: inBand.filter((o) => !(o.errorPoints <= 3) && !o.warnings.includes('ambiguous_reading')),
    }
  })
}

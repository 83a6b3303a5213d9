import { EngineError, type EngineWarning } from '../errors'

export interface BuildTimeAxisInput {
  sampleCount: number
  /** Printed times in seconds (already unit-converted), or null when the file has no time column. */
  printedTimes: Float64Array | null
  /** Interval stated in the file's metadata, seconds. */
  headerIntervalSeconds?: number | null
  /** Metadata key the stated interval came from (for messages). */
  headerIntervalKey?: string | null
  /** Start time stated in the file's metadata, seconds. */
  headerStartSeconds?: number | null
  /** Interval given by the caller, seconds. */
  optionIntervalSeconds?: number
}

export interface TimeAxis {
  time: Float64Array
  sampleInterval: number
  startTime: number
  warnings: EngineWarning[]
}

/** Relative disagreement under which a stated interval is taken as the same as the printed one. */
const INTERVAL_AGREEMENT = 0.01
/** At most this many broken printed times (or 0.1 % of samples) count as isolated glitches. */
const GLITCH_LIMIT = 10

/**
 * One uniform time axis in seconds. With printed times: estimate interval and start robustly (median of long
 * baselines, so a glitched sample cannot move them), keep the printed axis when every time lies within half an
 * interval of t0 + i·Δt, rebuild it from the interval otherwise (isolated glitches or coarse printing, with a
 * warning naming the samples), and refuse an axis that runs backwards. Without printed times: t0 + i·Δt from the
 * stated or given interval.
 */
export function buildTimeAxis(input: BuildTimeAxisInput): TimeAxis {
  const {
    sampleCount: n,
    printedTimes,
    headerIntervalSeconds = null,
    headerIntervalKey = null,
    headerStartSeconds = null,
    optionIntervalSeconds,
  } = input
  const warnings: EngineWarning[] = []
  if (optionIntervalSeconds !== undefined) assertInterval(optionIntervalSeconds)

  if (printedTimes === null) {
    const interval = optionIntervalSeconds ?? headerIntervalSeconds
    if (interval === null || !(interval > 0)) {
      throw new EngineError(
        'no_sample_interval',
        'The file has no time column and states no sample interval; give the interval in seconds (option sampleIntervalSeconds or --interval).',
      )
    }
    if (optionIntervalSeconds !== undefined && headerIntervalSeconds !== null && !agrees(optionIntervalSeconds, headerIntervalSeconds)) {
      warnings.push({
        code: 'interval_overridden',
        message: `The given sample interval ${optionIntervalSeconds} s was used instead of the file's "${headerIntervalKey}" (${headerIntervalSeconds} s).`,
      })
    }
    const start = headerStartSeconds ?? 0
    return { time: uniformAxis(n, start, interval), sampleInterval: interval, startTime: start, warnings }
  }

  let interval = estimateInterval(printedTimes)
  if (!Number.isFinite(interval)) {
    throw new EngineError('no_time_axis', 'The time column holds too few numbers to define a time axis.')
  }
  if (interval <= 0) {
    throw new EngineError(
      'time_axis_backwards',
      `The time axis runs backwards or stands still (from ${firstFinite(printedTimes)} s to ${lastFinite(printedTimes)} s).`,
    )
  }
  if (headerIntervalSeconds !== null && headerIntervalSeconds > 0) {
    if (agrees(headerIntervalSeconds, interval)) {
      interval = headerIntervalSeconds // the instrument's own statement is more precise than printed times
    } else {
      warnings.push({
        code: 'interval_mismatch',
        message: `The file's "${headerIntervalKey}" says ${headerIntervalSeconds} s but the printed times advance by ${interval.toPrecision(6)} s per sample; the printed times were used.`,
      })
    }
  }
  if (optionIntervalSeconds !== undefined && !agrees(optionIntervalSeconds, interval)) {
    warnings.push({
      code: 'interval_option_ignored',
      message: `The given sample interval ${optionIntervalSeconds} s was not used: the file's own time column advances by ${interval.toPrecision(6)} s per sample.`,
    })
  }
  const start = estimateStart(printedTimes, interval)

  const bad: number[] = []
  const tolerance = 0.5 * interval
  for (let i = 0; i < n; i++) {
    const deviation = printedTimes[i] - (start + i * interval)
    if (!(Math.abs(deviation) <= tolerance)) bad.push(i)
  }
  if (bad.length === 0) return { time: printedTimes, sampleInterval: interval, startTime: printedTimes[0], warnings }

  const isolated = bad.length <= Math.max(GLITCH_LIMIT, n * 0.001)
  if (!isolated) {
    const backwards = firstBackwardStep(printedTimes, interval)
    if (backwards >= 0) {
      throw new EngineError(
        'time_axis_backwards',
        `The time axis goes backwards at sample ${backwards + 1} (from ${printedTimes[backwards]} s to ${printedTimes[backwards + 1]} s) and does so too often to be a printing glitch.`,
      )
    }
  }
  const rebuilt = uniformAxis(n, start, interval)
  if (isolated) {
    const shown = bad.slice(0, 5).map((i) => `sample ${i} (printed ${printedTimes[i]} s, expected ${rebuilt[i].toPrecision(6)} s)`)
    warnings.push({
      code: 'time_axis_repaired',
      message: `${bad.length === 1 ? 'One printed time disagrees' : `${bad.length} printed times disagree`} with the sample interval: ${shown.join(', ')}${bad.length > 5 ? ', …' : ''}; the time axis was rebuilt as t0 + i × ${interval} s.`,
    })
  } else {
    warnings.push({
      code: 'time_axis_rebuilt',
      message: `${bad.length} of ${n} printed times lie more than half a sample interval from a uniform axis (coarse or irregular printing, first at sample ${bad[0]}); the time axis was rebuilt as t0 + i × ${interval} s.`,
    })
  }
  return { time: rebuilt, sampleInterval: interval, startTime: start, warnings }
}

function assertInterval(seconds: number): void {
  if (typeof seconds !== 'number' || !Number.isFinite(seconds) || seconds <= 0) {
    throw new EngineError('invalid_option', `The sample interval must be a positive number of seconds, not ${String(seconds)}.`)
  }
}

function agrees(a: number, b: number): boolean {
  return Math.abs(a - b) <= INTERVAL_AGREEMENT * Math.abs(b)
}

function uniformAxis(n: number, start: number, interval: number): Float64Array {
  const time = new Float64Array(n)
  for (let i = 0; i < n; i++) time[i] = start + i * interval
  return time
}

function median(values: number[]): number {
  if (values.length === 0) return NaN
  const sorted = [...values].sort((a, b) => a - b)
  return sorted[Math.floor(sorted.length / 2)]
}

/** Median slope over long, nested baselines (i, n−1−i): one wrong time cannot move it. */
function estimateInterval(times: Float64Array): number {
  const n = times.length
  const slopes: number[] = []
  for (let k = 0; k < 9; k++) {
    const i = Math.floor((k * (n - 1)) / 20)
    const j = n - 1 - i
    if (j - i < Math.max(1, n / 10)) continue
    const slope = (times[j] - times[i]) / (j - i)
    if (Number.isFinite(slope)) slopes.push(slope)
  }
  return median(slopes)
}

function estimateStart(times: Float64Array, interval: number): number {
  const n = times.length
  const offsets: number[] = []
  const count = Math.min(n, 201)
  for (let m = 0; m < count; m++) {
    const i = Math.floor((m * (n - 1)) / Math.max(1, count - 1))
    const offset = times[i] - i * interval
    if (Number.isFinite(offset)) offsets.push(offset)
  }
  return median(offsets)
}

/** First i where time steps back by more than half an interval, when that is not a lone glitch. */
function firstBackwardStep(times: Float64Array, interval: number): number {
  for (let i = 0; i + 1 < times.length; i++) {
    if (times[i + 1] < times[i] - 0.5 * interval) return i
  }
  return -1
}

function firstFinite(values: Float64Array): number {
  for (const value of values) if (Number.isFinite(value)) return value
  return NaN
}

function lastFinite(values: Float64Array): number {
  for (let i = values.length - 1; i >= 0; i--) if (Number.isFinite(values[i])) return values[i]
  return NaN
}

/**
 * One trace of a comparison, ready to overlay on another: the analysed sweep only (no flyback), its
 * time axis mapped to FSR units from the first TEM00 (`timeToFsr`), turned so optical frequency rises
 * left to right whichever way the piezo swept, and the transmission scaled so the tallest TEM00
 * resonance above the dark level is 1. Two traces of one cavity then line up order by order.
 */
import type { AnalysisResult } from '../../../shared/analysis/types'
import type { Trace } from '../../../shared/trace/types'
import { decimateMinMax } from '../trace/decimateMinMax'
import { canCalibrate, timeToFsr } from '../trace/sweepAxis'

export interface OverlaySeries {
  /** FSR units, rising. */
  x: Float64Array
  /** Transmission relative to the tallest TEM00 (dimensionless). */
  y: Float64Array
}

type OverlayResult = Pick<AnalysisResult, 'peaks' | 'sweep' | 'noise' | 'channels'>

/** The overlay of `trace` as analysed by `result`, min/max-decimated to `buckets` columns; null when the sweep cannot be calibrated. */
export function fsrOverlay(trace: Trace, result: OverlayResult, buckets = 1200): OverlaySeries | null {
  const fundamentals = result.peaks.filter((peak) => peak.kind === 'carrier' && peak.order === 0)
  const times = fundamentals.map((peak) => peak.t)
  if (!canCalibrate(times)) return null
  const channel = trace.channels.find((c) => c.name === result.channels.transmission) ?? trace.channels.find((c) => c.role === 'transmission') ?? trace.channels[0]
  if (!channel) return null
  const start = Math.min(result.sweep.startTime, result.sweep.endTime)
  const end = Math.max(result.sweep.startTime, result.sweep.endTime)
  let from = 0
  while (from < trace.time.length && trace.time[from] < start) from++
  let to = from
  while (to < trace.time.length && trace.time[to] <= end) to++
  if (to - from < 2) return null
  const fsr = timeToFsr(trace.time.subarray(from, to), times)
  // Optical frequency falling with time: mirror about the last TEM00 so it rises left to right.
  if (result.sweep.direction === 'down') {
    const last = times.length - 1
    for (let i = 0; i < fsr.length; i++) fsr[i] = last - fsr[i]
    fsr.reverse()
  }
  const dark = result.noise.darkLevelV
  const tallest = Math.max(...fundamentals.map((peak) => peak.height))
  const scale = tallest > 0 ? 1 / tallest : 1
  const values = new Float64Array(to - from)
  for (let i = 0; i < values.length; i++) values[i] = (channel.values[from + i] - dark) * scale
  if (result.sweep.direction === 'down') values.reverse()
  const kept = decimateMinMax(fsr, values, buckets)
  return { x: kept.x, y: kept.y }
}

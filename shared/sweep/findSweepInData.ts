import { median } from '../numbers'
import type { SweepSelection } from './selectSweep'

/** A tall resonance seen in the whole record. */
export interface TallPeak {
  centerIndex: number
  heightV: number
  fwhmSamples: number
}

export interface FindSweepInDataOptions {
  /** Peaks at least this fraction of the tallest take part. @default 0.5 */
  tallFraction?: number
  /** Neighbouring tall peaks whose widths differ by more than this factor belong to different sweep legs. @default 1.6 */
  widthRatio?: number
}

/**
 * Finds the sweep without a ramp channel. Within one leg of a sweep every resonance of the same order has the same
 * width in time (width = linewidth / sweep rate), while a flyback crosses the same resonances many times faster, so
 * they come out much narrower (common practice). Tall peaks are split into runs of similar width, and the run that
 * spans the longest time is the sweep; the part ends half-way to the first tall peak outside it.
 */
export function findSweepInData(peaks: TallPeak[], sampleCount: number, options: FindSweepInDataOptions = {}): SweepSelection {
  const { tallFraction = 0.5, widthRatio = 1.6 } = options
  const whole: SweepSelection = {
    startIndex: 0,
    endIndex: sampleCount,
    rampDirection: 'unknown',
    evidence: 'No ramp channel: the whole record is used.',
    segmentCount: 0,
  }
  if (peaks.length < 3) return whole
  const top = Math.max(...peaks.map((p) => p.heightV))
  const tall = peaks.filter((p) => p.heightV >= tallFraction * top).sort((a, b) => a.centerIndex - b.centerIndex)
  if (tall.length < 3) return whole
  const runs: TallPeak[][] = [[tall[0]]]
  for (let k = 1; k < tall.length; k++) {
    const run = runs[runs.length - 1]
    const reference = median(run.map((p) => p.fwhmSamples))
    const r = tall[k].fwhmSamples / reference
    if (r <= widthRatio && r >= 1 / widthRatio) run.push(tall[k])
    else runs.push([tall[k]])
  }
  if (runs.length === 1) return whole
  let best = 0
  const span = (run: TallPeak[]) => run[run.length - 1].centerIndex - run[0].centerIndex
  for (let r = 1; r < runs.length; r++) if (span(runs[r]) > span(runs[best])) best = r
  const run = runs[best]
  const before = best > 0 ? runs[best - 1][runs[best - 1].length - 1].centerIndex : null
  const after = best + 1 < runs.length ? runs[best + 1][0].centerIndex : null
  const startIndex = before === null ? 0 : Math.max(0, Math.ceil((before + run[0].centerIndex) / 2))
  const endIndex = after === null ? sampleCount : Math.min(sampleCount, Math.floor((after + run[run.length - 1].centerIndex) / 2) + 1)
  return {
    startIndex,
    endIndex,
    rampDirection: 'unknown',
    evidence: `No ramp channel: the sweep was found from the data (${run.length} tall resonances of one width; ${tall.length - run.length} narrower or wider ones, on the flyback or turnaround, were left out).`,
    segmentCount: runs.length,
  }
}

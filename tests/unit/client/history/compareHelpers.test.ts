/**
 * The comparison overlay: a trace mapped to FSR units and scaled to its tallest TEM00, and the logbook's
 * merge of several cavities' entries. TEM00 resonances sit one FSR apart (Siegman, "Lasers" (1986),
 * §11.3), so the k-th TEM00 must land on k; the trace is invented.
 */
import { describe, expect, it } from 'vitest'
import type { AnalysisResult } from '../../../../shared/analysis/types'
import type { Trace } from '../../../../shared/trace/types'
import { fsrOverlay } from '../../../../src/components/history/fsrOverlay'

type OverlayResult = Pick<AnalysisResult, 'peaks' | 'sweep' | 'noise' | 'channels'>

/** 1001 samples over 0–1 s, dark level 0.1 V, TEM00 spikes of 0.5 V at 0.2 s and 0.6 s and an order-1 spike of 0.1 V at 0.3 s. */
function tinyTrace(): Trace {
  const time = new Float64Array(1001)
  const values = new Float64Array(1001)
  for (let i = 0; i < time.length; i++) {
    time[i] = i / 1000
    values[i] = 0.1
  }
  values[200] = 0.6
  values[600] = 0.6
  values[300] = 0.2
  return { sampleCount: 1001, sampleInterval: 1e-3, startTime: 0, time, channels: [{ name: 'CH1', unit: 'V', values, role: 'transmission', roleEvidence: 'invented' }], metadata: {}, warnings: [] }
}

function tinyResult(direction: 'up' | 'down'): OverlayResult {
  const peak = (t: number, order: number, height: number) => ({ t, order, kind: 'carrier' as const, height, fwhmSeconds: 1e-3, share: null })
  return {
    peaks: [peak(0.2, 0, 0.5), peak(0.3, 1, 0.1), peak(0.6, 0, 0.5)] as unknown as AnalysisResult['peaks'],
    sweep: { direction, rampDirection: 'rising', startTime: 0.1, endTime: 0.9, evidence: 'invented' },
    noise: { sigmaV: 0.001, darkLevelV: 0.1 },
    channels: { transmission: 'CH1', ramp: null } as unknown as AnalysisResult['channels'],
  }
}

const valueAt = (series: { x: Float64Array; y: Float64Array }, x: number) => {
  let best = 0
  for (let i = 0; i < series.x.length; i++) if (Math.abs(series.x[i] - x) < Math.abs(series.x[best] - x)) best = i
  return { x: series.x[best], y: series.y[best] }
}

describe('fsrOverlay', () => {
  it('when the sweep rises then TEM00s land on 0 and 1 FSR at height 1 and the order-1 line at 0.25 FSR, flyback cut off', () => {
    const overlay = fsrOverlay(tinyTrace(), tinyResult('up'), 2000)!
    expect(overlay.x[0]).toBeCloseTo(-0.25, 10) // 0.1 s is a quarter FSR (0.4 s) before the first TEM00
    expect(overlay.x[overlay.x.length - 1]).toBeCloseTo(1.75, 10)
    expect(valueAt(overlay, 0).y).toBeCloseTo(1, 10)
    expect(valueAt(overlay, 1).y).toBeCloseTo(1, 10)
    expect(valueAt(overlay, 0.25).y).toBeCloseTo(0.2, 10)
    expect(valueAt(overlay, 0.5).y).toBeCloseTo(0, 10) // the dark level is taken off
  })

  it('when the optical frequency falls with time then the axis is mirrored so it rises left to right', () => {
    const overlay = fsrOverlay(tinyTrace(), tinyResult('down'), 2000)!
    for (let i = 1; i < overlay.x.length; i++) expect(overlay.x[i]).toBeGreaterThanOrEqual(overlay.x[i - 1])
    // The order-1 line, 0.25 FSR after the first TEM00 in time, now sits 0.25 FSR below the upper TEM00 at 1.
    expect(valueAt(overlay, 0.75).y).toBeCloseTo(0.2, 10)
    expect(valueAt(overlay, 0).y).toBeCloseTo(1, 10)
  })

  it('when the analysis found only one TEM00 then there is no overlay', () => {
    const result = tinyResult('up')
    result.peaks = result.peaks.slice(0, 2)
    expect(fsrOverlay(tinyTrace(), result)).toBeNull()
  })
})

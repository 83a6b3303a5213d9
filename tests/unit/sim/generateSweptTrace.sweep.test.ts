import { describe, expect, it } from 'vitest'
import { generateSweptTrace, type SweptTraceOptions } from '../../../shared/sim'
import { argMax, indexAt, refinedPeakTime } from './helpers'

const base: SweptTraceOptions = {
  gouyOneWayRad: 0.9,
  finesse: 500,
  orderPowers: [0.8, 0.2],
  sampleCount: 100_000,
  fsrCount: 4.3,
  startDetuningFsr: 0.3,
  noiseFraction: 0,
  darkOffsetV: 0,
  seed: 3,
}

describe('generateSweptTrace sweep and ramp', () => {
  it('when the piezo is nonlinear then the ramp stays linear in time while the TEM00 spacing changes', () => {
    const trace = generateSweptTrace({ ...base, nonlinearity: 0.15 })
    const { truth, tSeconds, rampV, transmissionV, sampleIntervalSeconds } = trace
    expect(rampV).not.toBeNull()
    // Straight-line fit of the ramp over the main sweep: residuals are the monitor noise only (2 mV rms).
    const from = indexAt(tSeconds, truth.sweepStartSeconds) + 10
    const to = indexAt(tSeconds, truth.sweepEndSeconds) - 10
    const slope = (rampV![to] - rampV![from]) / (tSeconds[to] - tSeconds[from])
    let worst = 0
    for (let i = from; i < to; i += 97) worst = Math.max(worst, Math.abs(rampV![i] - (rampV![from] + slope * (tSeconds[i] - tSeconds[from]))))
    expect(worst).toBeLessThan(0.02)
    expect(slope).toBeGreaterThan(0)
    // The local sweep rate changes by about −6 % … +15 % across the sweep (p'(r) from 1 − 0.42k to 1 + k, k = 0.15):
    // the first TEM00 spacing is longer than the last.
    const fundamentals = truth.peaks.filter((p) => p.order === 0)
    expect(fundamentals.length).toBe(4)
    const first = fundamentals[1].t - fundamentals[0].t
    const last = fundamentals[3].t - fundamentals[2].t
    expect(first / last).toBeGreaterThan(1.1)
    // Truth follows the nonlinear sweep: the signal's maxima are where the truth says.
    for (const peak of fundamentals) {
      const top = argMax(transmissionV, indexAt(tSeconds, peak.t) - 100, indexAt(tSeconds, peak.t) + 100)
      expect(Math.abs(refinedPeakTime(tSeconds, transmissionV, top) - peak.t)).toBeLessThan(0.1 * sampleIntervalSeconds)
    }
    // fsrSeconds is the mean TEM00 spacing, as an analysis would average it; the sweep-wide mean is kept apart.
    expect(truth.fsrSeconds).toBeCloseTo((fundamentals[3].t - fundamentals[0].t) / 3, 12)
    expect(truth.sweepMeanFsrSeconds).toBeCloseTo((truth.sweepEndSeconds - truth.sweepStartSeconds) / 4.3, 12)
    expect(Math.abs(truth.fsrSeconds / truth.sweepMeanFsrSeconds - 1)).toBeGreaterThan(1e-3)
  })

  it('when the ramp is a sawtooth then it rises through the main sweep and flies back outside it', () => {
    const { truth, tSeconds, rampV } = generateSweptTrace({ ...base, sweepFractionOfRecord: 0.8 })
    const start = indexAt(tSeconds, truth.sweepStartSeconds)
    const end = indexAt(tSeconds, truth.sweepEndSeconds)
    expect(rampV![start]).toBeCloseTo(0, 1)
    expect(rampV![end]).toBeCloseTo(5, 1)
    // Flyback is 4× faster than the sweep (0.2 vs 0.8 of the period) and the record starts and ends mid-flyback.
    expect(rampV![0]).toBeCloseTo(2.5, 1)
    expect(rampV![rampV!.length - 1]).toBeCloseTo(2.5, 1)
    const sweepSlope = (rampV![end - 100] - rampV![start + 100]) / (end - start - 200)
    const flybackSlope = (rampV![rampV!.length - 100] - rampV![end + 100]) / (rampV!.length - end - 200)
    expect(flybackSlope / sweepSlope).toBeCloseTo(-4, 1)
  })

  it('when the ramp is a triangle then the reverse leg has the same speed and crosses the same resonances', () => {
    const { truth, tSeconds, rampV, transmissionV } = generateSweptTrace({ ...base, rampShape: 'triangle', sweepFractionOfRecord: 0.6 })
    const start = indexAt(tSeconds, truth.sweepStartSeconds)
    const end = indexAt(tSeconds, truth.sweepEndSeconds)
    const sweepSlope = (rampV![end - 100] - rampV![start + 100]) / (end - start - 200)
    const reverseSlope = (rampV![rampV!.length - 100] - rampV![end + 100]) / (rampV!.length - end - 200)
    expect(reverseSlope / sweepSlope).toBeCloseTo(-1, 2)
    // The reverse leg shows TEM00 peaks too (mirror images of the sweep's): the signal reaches 1 V after the sweep.
    expect(transmissionV[argMax(transmissionV, end + 10, transmissionV.length)]).toBeGreaterThan(0.9)
  })

  it('when includeRamp is false then no ramp channel is returned', () => {
    expect(generateSweptTrace({ ...base, includeRamp: false }).rampV).toBeNull()
  })

  it('when no start time is given then the trigger is centred: time runs from −n/2·dt', () => {
    const { tSeconds, sampleIntervalSeconds } = generateSweptTrace({ ...base, sampleIntervalSeconds: 2e-6 })
    expect(sampleIntervalSeconds).toBe(2e-6)
    expect(tSeconds[0]).toBeCloseTo(-0.1, 12)
    expect(tSeconds[50_000]).toBeCloseTo(0, 12)
    const shifted = generateSweptTrace({ ...base, startTimeSeconds: 0 })
    expect(shifted.tSeconds[0]).toBe(0)
    expect(shifted.truth.sweepStartSeconds).toBeCloseTo(0.05, 12)
  })
})

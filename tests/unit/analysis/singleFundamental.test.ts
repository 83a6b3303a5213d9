import { describe, expect, it } from 'vitest'
import { analyzeTrace } from '../../../shared/analysis/analyzeTrace'
import type { CavityGeometry } from '../../../shared/cavity'
import { generateSweptTrace } from '../../../shared/sim/generateSweptTrace'
import { traceFromSim } from './traceFromSim'

const cavity: CavityGeometry = { wavelengthNm: 1064, lengthMm: 100, roc1Mm: null, roc2Mm: 500 }

describe('a sweep with a single TEM00 resonance', () => {
  it('when only one TEM00 is swept then the fraction is a rough share of all resonance power, flagged, and the reading says orders cannot be placed', () => {
    // 0.85 FSR of sweep from 0.2 FSR: orders 1 and 2 (at 0.295 and 0.590 FSR for this cavity), then one TEM00.
    const sim = generateSweptTrace({ cavity, gouyOneWayRad: 0, finesse: 300, orderPowers: [0.7, 0.2, 0.1], sampleCount: 20_000, fsrCount: 0.85, startDetuningFsr: 0.2, noiseFraction: 0.002, seed: 3 })
    const swept = sim.truth.peaks.filter((p) => p.t >= sim.truth.sweepStartSeconds! && p.t <= sim.truth.sweepEndSeconds!)
    const fundamentals = swept.filter((p) => p.order === 0 && p.kind === 'carrier')
    expect(fundamentals).toHaveLength(1)
    expect(swept.length).toBeGreaterThan(1)
    // What can be known without a calibration: TEM00 power against all resonance power in the sweep (from the truth).
    const seenShare = fundamentals[0].power / swept.reduce((sum, p) => sum + p.power, 0)
    const result = analyzeTrace(traceFromSim(sim), cavity)
    expect(result.warnings.map((w) => w.code)).toContain('single_fundamental')
    // Without a calibration no order can be placed: the fraction may be far off, and the result says so.
    expect(result.calibration.fundamentalTimes.length).toBeLessThan(2)
    expect(result.warnings.find((w) => w.code === 'ambiguous_reading')?.message).toMatch(/could not be calibrated/)
    // Not the 100 % a TEM00-only count would give: the other resonances' power counts against it.
    expect(seenShare).toBeLessThan(0.95)
    expect(result.fundamentalFraction).toBeCloseTo(seenShare, 1)
    expect(result.reading).toMatch(/cannot be told apart/)
  })
})

import { describe, expect, it } from 'vitest'
import { analyzeTrace } from '../../../shared/analysis/analyzeTrace'
import type { CavityGeometry } from '../../../shared/cavity'
import { ladderReading } from '../../../shared/orders/ladderReading'
import { generateSweptTrace } from '../../../shared/sim/generateSweptTrace'
import { traceFromSim } from './traceFromSim'

// 1064 nm, 100 mm, flat / 500 mm: ψ/π = 0.2952, so orders 1, 2, 3 sit 0.295, 0.590, 0.886 FSR above TEM00
// (Siegman, "Lasers" (1986), ch. 19) — equally spaced, like a comb.
const cavity: CavityGeometry = { wavelengthNm: 1064, lengthMm: 100, roc1Mm: null, roc2Mm: 500 }

describe('one TEM00 followed by its transverse ladder', () => {
  it('when the sweep holds one TEM00 then orders 1 and 2 then it is not read as a TEM00 comb', () => {
    // 0.9 FSR of sweep starting just before a TEM00: TEM00, order 1, order 2 equally spaced in time.
    const sim = generateSweptTrace({ cavity, gouyOneWayRad: 0, finesse: 300, orderPowers: [0.7, 0.2, 0.1], sampleCount: 20_000, fsrCount: 0.9, startDetuningFsr: -0.05, noiseFraction: 0.002, seed: 3 })
    const swept = sim.truth.peaks.filter((p) => p.t >= sim.truth.sweepStartSeconds! && p.t <= sim.truth.sweepEndSeconds!)
    const fundamentals = swept.filter((p) => p.order === 0 && p.kind === 'carrier')
    expect(fundamentals).toHaveLength(1)
    expect(swept.filter((p) => p.order === 1 || p.order === 2)).toHaveLength(2)
    // Without a calibration the best figure is TEM00 power over all resonance power in the sweep (from the truth).
    const seenShare = fundamentals[0].power / swept.reduce((sum, p) => sum + p.power, 0)
    const result = analyzeTrace(traceFromSim(sim), cavity)
    const codes = result.warnings.map((w) => w.code)
    expect(codes).toContain('single_fundamental')
    expect(codes).not.toContain('two_fundamentals')
    expect(seenShare).toBeLessThan(0.8)
    expect(Math.abs(result.fundamentalFraction - seenShare)).toBeLessThan(0.02)
  })

  it('when comb members have comparable heights then the comb is kept', () => {
    // Three TEM00s one spacing apart with heights within 20 % (common practice: TEM00 heights vary with laser power).
    const peaks = [
      { center: 1000, height: 1 },
      { center: 1300, height: 0.1 },
      { center: 4000, height: 0.85 },
      { center: 7000, height: 0.95 },
    ]
    expect(ladderReading(peaks, { members: [0, 2, 3], fsrIndex: [0, 1, 2] }, 0.2952 * Math.PI, 8000)).toBe('comb')
  })

  it('when heights fall by large factors at the ladder spacing and no second TEM00 fits in the sweep then it is a ladder', () => {
    const gouy = 0.2952 * Math.PI
    const peaks = [
      { center: 1000, height: 1 },
      { center: 3000, height: 0.3 },
      { center: 5000, height: 0.14 },
    ]
    // Ladder FSR = 2000 / 0.2952 ≈ 6775 samples: the next TEM00 would sit past the end of an 7000-sample sweep.
    expect(ladderReading(peaks, { members: [0, 1, 2], fsrIndex: [0, 1, 2] }, gouy, 7000)).toBe('ladder')
    // In a longer sweep the ladder's second TEM00 would be visible: keep the comb reading.
    expect(ladderReading(peaks, { members: [0, 1, 2], fsrIndex: [0, 1, 2] }, gouy, 20000)).toBe('comb')
  })

  it('when only two tall resonances are seen and nothing else tells the readings apart then they stay a TEM00 comb', () => {
    // Two TEM00 with the laser power halving between them fit the ladder reading (TEM00, then order 1 at half its
    // height) exactly as well: with nothing to choose, TEM00 is the usual tall resonance (common practice).
    const gouy = 0.2952 * Math.PI
    const peaks = [
      { center: 1000, height: 1 },
      { center: 3000, height: 0.5 },
    ]
    expect(ladderReading(peaks, { members: [0, 1], fsrIndex: [0, 1] }, gouy, 7000)).toBe('either')
  })

  it('when a short falling sweep shows only order 1 then TEM00 then the result says the two may be one TEM00 and its order 1', () => {
    // 0.9 FSR, frequency falling: order 1 (20 %) then TEM00 (70 %) in time, order 2 outside the sweep.
    const sim = generateSweptTrace({ cavity, gouyOneWayRad: 0, finesse: 300, orderPowers: [0.7, 0.2, 0.1], sampleCount: 20_000, fsrCount: 0.9, startDetuningFsr: 0.2, direction: 'down', noiseFraction: 0.002, seed: 3 })
    const swept = sim.truth.peaks.filter((p) => p.t >= sim.truth.sweepStartSeconds! && p.t <= sim.truth.sweepEndSeconds!)
    expect(swept.map((p) => p.order)).toEqual([1, 0])
    const warning = analyzeTrace(traceFromSim(sim), cavity).warnings.find((w) => w.code === 'comb_or_ladder')
    expect(warning?.message).toMatch(/one TEM00 and its order-1 mode just as well/)
  })
})

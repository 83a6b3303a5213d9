import { describe, expect, it } from 'vitest'
import { analyzeTrace } from '../../../shared/analysis/analyzeTrace'
import type { AnalysisResult } from '../../../shared/analysis/types'
import { generateSweptTrace, type SweptTraceOptions } from '../../../shared/sim'
import { accuracyCase } from '../accuracy/accuracyCases'
import { traceFromSim } from './traceFromSim'

/**
 * Traces where the resonances found one by one say too little, or mislead: each was found by running the accuracy
 * suite's cases with other seeds, and each failed before the change its test describes.
 */
function analyse(options: SweptTraceOptions): { result: AnalysisResult; truth: ReturnType<typeof generateSweptTrace>['truth'] } {
  const sim = generateSweptTrace(options)
  return { result: analyzeTrace(traceFromSim(sim), { ...options.cavity!, modulationMHz: options.modulationMHz }), truth: sim.truth }
}

describe('weak or misleading evidence', () => {
  it('when no transverse resonance stands out on its own then the direction comes from the weak lines measured over every FSR', () => {
    // 2 M samples, finesse 3000, 3 % noise, orders 1–3 at 1.5, 1 and 0.5 %: no transverse peak passes detection, but
    // the matched filter summed over the sweep's FSRs sees order 1 at about 9σ (Press et al., "Numerical Recipes", §15.4).
    const { result, truth } = analyse({ ...accuracyCase(29), seed: 1001 })
    expect(result.peaks.some((p) => p.kind === 'carrier' && (p.order ?? 0) > 0)).toBe(false)
    expect(result.sweep.direction).toBe(truth.direction)
    expect(result.sweep.directionEvidence).toMatch(/measured at their predicted places over every FSR/)
    expect(result.orders['1']).toBeGreaterThan(0)
    expect(result.orders['2']).toBeGreaterThan(0)
    expect(Math.abs(result.fundamentalFraction - truth.fundamentalFraction)).toBeLessThan(0.01)
  })

  it('when a record without a ramp channel runs past a turn of the sweep then the TEM00 seen again beyond it does not decide the direction', () => {
    // Triangle drive, no ramp channel: near each end the sweep turns and a TEM00 comes back at a transverse place.
    const { result, truth } = analyse({ ...accuracyCase(27), seed: 5027 })
    expect(result.channels.ramp).toBeNull()
    expect(result.sweep.direction).toBe(truth.direction)
    expect(Object.keys(result.orders).sort()).toEqual(['0', '1', '2'])
    expect(Math.abs(result.fundamentalFraction - truth.fundamentalFraction)).toBeLessThan(0.005)
  })

  it('when a ramp-less record runs past a turn then the TEM00 beyond it stays out of the line model and the finesse holds', () => {
    // Triangle drive, no ramp channel, 200 samples per linewidth, finesse 600: the TEM00 seen again after the
    // turn sits where no line is predicted; modelled, it pushed χ²ᵥ to 1.4 and the finesse 4 % off.
    const { result, truth } = analyse(accuracyCase(47))
    expect(result.channels.ramp).toBeNull()
    expect(result.peaks.some((p) => p.kind === 'unassigned' && p.height > 0.5)).toBe(true)
    expect(result.fitQuality.lineModelReducedChiSquare!).toBeLessThan(1.1)
    expect(Math.abs(result.finesse! / truth.finesse - 1)).toBeLessThan(0.01)
  })

  it('when the record ends on the flank of a TEM00 resonance then its wing is modelled and the line model still fits', () => {
    // Finesse 50: a TEM00 centred just past the end of the record leaves a tall wing inside it.
    const { result, truth } = analyse({ ...accuracyCase(20), seed: 5020 })
    expect(result.fitQuality.lineModelReducedChiSquare!).toBeLessThan(1.5)
    expect(result.measure).toBe('height')
    expect(Math.abs(result.fundamentalFraction - truth.fundamentalFraction)).toBeLessThan(0.005)
  })

  it('when weak orders fall below the noise then they still count in the total, so the TEM00 fraction is not pushed up', () => {
    // 2,500 samples, 3.6 samples per linewidth, 3 % noise, orders 1–3 at 5, 3 and 2 %: orders 2 and 3 sit near
    // the noise. Leaving the unreported ones out of the total raised the fraction by 2.5 points on average.
    const errors: number[] = []
    for (let seed = 0; seed < 16; seed++) {
      const { result, truth } = analyse({ ...accuracyCase(30), seed: 7000 + seed })
      const labelled = Object.values(result.orders).reduce((sum, share) => sum + share, 0)
      expect(labelled + result.belowNoiseShare!).toBeCloseTo(1, 9)
      errors.push(result.fundamentalFraction - truth.fundamentalFraction)
    }
    const mean = errors.reduce((sum, e) => sum + e, 0) / errors.length
    // The scatter of one trace is about 2.3 points, so the mean of 16 has a standard error near 0.6 points.
    expect(Math.abs(mean)).toBeLessThan(0.015)
  })
})

describe('order estimates and their errors', () => {
  it('when the line model measures the orders then every order has an estimate, the reported ones are the orders, and the shares sum to 1', () => {
    const { result } = analyse({ ...accuracyCase(29), seed: 129 })
    const estimates = result.orderEstimates!
    expect(estimates.map((e) => e.order)).toEqual([0, 1, 2, 3, 4])
    expect(estimates.reduce((sum, e) => sum + e.share, 0)).toBeCloseTo(1, 9)
    expect(estimates.filter((e) => e.reported).map((e) => String(e.order))).toEqual(Object.keys(result.orders))
    for (const e of estimates.filter((x) => x.reported)) expect(e.share).toBeCloseTo(result.orders[String(e.order)], 12)
    expect(estimates[0].shareError).toBeCloseTo(result.fundamentalFractionError!, 12)
    // Below 3σ means not reported, and the unreported shares make up belowNoiseShare.
    for (const e of estimates.filter((x) => !x.reported)) expect(e.significance!).toBeLessThan(3)
    expect(estimates.filter((e) => !e.reported).reduce((sum, e) => sum + e.share, 0)).toBeCloseTo(result.belowNoiseShare!, 12)
  })

  it('when the same cavity is swept 30 times with fresh noise then the TEM00 fraction scatters as its stated error says', () => {
    // 20,000 samples, finesse 600, 3 % noise, sidebands: the pull (error / stated error) of an honest error bar
    // has an RMS near 1 (Bevington & Robinson, "Data Reduction and Error Analysis", §4.1); 30 draws put the RMS
    // within about ±0.13 of it (1/√(2·30)), so 0.7–1.4 leaves room.
    const pulls: number[] = []
    for (let seed = 0; seed < 30; seed++) {
      const { result, truth } = analyse({ ...accuracyCase(13), seed: 7000 + seed })
      pulls.push((result.fundamentalFraction - truth.fundamentalFraction) / result.fundamentalFractionError!)
    }
    const rms = Math.sqrt(pulls.reduce((sum, p) => sum + p * p, 0) / pulls.length)
    expect(rms).toBeGreaterThan(0.7)
    expect(rms).toBeLessThan(1.4)
  })
})

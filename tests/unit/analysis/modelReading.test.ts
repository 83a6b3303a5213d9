import { describe, expect, it } from 'vitest'
import { analyzeTrace } from '../../../shared/analysis/analyzeTrace'
import { computeCavityModel, type CavityGeometry } from '../../../shared/cavity'
import { beamOrderPowers, generateSweptTrace, type SweptTraceOptions } from '../../../shared/sim'
import { traceFromSim } from './traceFromSim'

// The model-based reading of issue 12 on single generated traces with known truth (shared/sim): which family is
// TEM00, the direction and the Gouy phase are read from the whole pattern, not from the tallest comb.
const cavity: CavityGeometry = { wavelengthNm: 1064, lengthMm: 150, roc1Mm: 250, roc2Mm: 250 }
const base: SweptTraceOptions = {
  gouyOneWayRad: 0,
  cavity,
  finesse: 400,
  orderPowers: [0.9, 0.05, 0.03, 0.02],
  sampleCount: 40_000,
  fsrCount: 3.2,
  nonlinearity: 0.08,
  noiseFraction: 0.004,
  seed: 12,
}
const codes = (r: { warnings: { code: string }[] }) => r.warnings.map((w) => w.code)
const analyse = (options: Partial<SweptTraceOptions>, entered: CavityGeometry = cavity, direction?: 'up' | 'down') => {
  const sim = generateSweptTrace({ ...base, ...options })
  return { sim, result: analyzeTrace(traceFromSim(sim), entered, direction ? { sweepDirection: direction } : {}) }
}
/** Order powers of a beam offset by 1.2 waists and tilted by 0.6 divergences (shared/sim/beamOrderPowers). */
const misaligned = beamOrderPowers({ offsetX: 1.2, tiltY: 0.6, waistRatio: 1.3 }, { maxOrder: 6 })

describe('reading the spectrum against the cavity', () => {
  it('when a badly misaligned beam puts more power in order 1 than in TEM00 then TEM00 is still found and the fraction holds', () => {
    expect(misaligned[1]).toBeGreaterThan(misaligned[0])
    const { sim, result } = analyse({ orderPowers: misaligned, peakHeightV: 0.6 })
    expect(Math.abs(result.fundamentalFraction - sim.truth.fundamentalFraction)).toBeLessThan(0.01)
    expect(result.fundamentalFraction).toBeLessThan(0.4)
    // The TEM00 comb of the result is the truth's TEM00, not the taller order-1 family.
    const truthTem00 = sim.truth.peaks.filter((p) => p.order === 0 && p.kind === 'carrier').map((p) => p.t)
    for (const t of result.calibration.fundamentalTimes) expect(Math.min(...truthTem00.map((u) => Math.abs(u - t)))).toBeLessThan(1e-3 * sim.truth.sweepMeanFsrSeconds)
    expect(codes(result)).not.toContain('ambiguous_reading')
  })

  it('when the sweep holds a single TEM00 then the transverse families that repeat calibrate it and the orders are placed', () => {
    // 1.7 FSR starting 0.15 FSR above a TEM00: one TEM00 in view, orders 1 and 2 (0.369 and 0.738 FSR above it) twice.
    const { sim, result } = analyse({ orderPowers: [0.6, 0.25, 0.15], fsrCount: 1.7, startDetuningFsr: 0.15 })
    expect(sim.truth.peaks.filter((p) => p.order === 0 && p.kind === 'carrier')).toHaveLength(1)
    expect(result.calibration.fundamentalCount).toBe(1)
    expect(Math.abs(result.fundamentalFraction - sim.truth.fundamentalFraction)).toBeLessThan(0.01)
    expect(result.orders['1']).toBeGreaterThan(0.2)
    expect(result.orders['2']).toBeGreaterThan(0.1)
    // The warning says how the sweep was calibrated, not that nothing could be placed.
    expect(result.warnings.find((w) => w.code === 'single_fundamental')!.message).toMatch(/calibrated on the transverse families/)
    // The local FSR at the TEM00 against the sweep model's own (truth fsrSecondsHere): within 1 % here.
    const here = sim.truth.peaks.find((p) => p.order === 0 && p.kind === 'carrier')!.fsrSecondsHere!
    expect(Math.abs(result.fsr.seconds! / here - 1)).toBeLessThan(0.01)
  })

  it('when the length is entered 5 % too long then the Gouy phase comes from the data and the warning names the true length within 1 %', () => {
    const { sim, result } = analyse({ orderPowers: [0.6, 0.2, 0.12, 0.08] }, { ...cavity, lengthMm: 157.5 })
    expect(Math.abs(result.fundamentalFraction - sim.truth.fundamentalFraction)).toBeLessThan(0.01)
    expect(codes(result)).toContain('geometry_mismatch')
    expect(Math.abs(result.gouy.impliedLengthMm! / 150 - 1)).toBeLessThan(0.01)
    // ψ = arccos(g) for the symmetric cavity, g = 1 − L/R (Siegman, "Lasers" (1986), ch. 19).
    expect(Math.abs(result.gouy.measuredOneWayRad! / computeCavityModel(cavity).gouyOneWayRad - 1)).toBeLessThan(0.005)
  })

  it('when the geometry is right and the beam well matched then neither doubt is raised', () => {
    const { sim, result } = analyse({})
    expect(Math.abs(result.fundamentalFraction - sim.truth.fundamentalFraction)).toBeLessThan(0.005)
    expect(codes(result)).not.toContain('ambiguous_reading')
    expect(codes(result)).not.toContain('geometry_mismatch')
    expect(result.alternativeReading).toBeNull()
  })

  it('when the detector rings after each resonance then its lobes are folded into their resonance and the fraction holds', () => {
    const linewidthSeconds = (0.9 * base.sampleCount * 1e-5) / base.fsrCount / base.finesse
    // A ringing period of 3 linewidths, decaying over two periods.
    const { sim, result } = analyse({ detectorRingHz: 1 / (3 * linewidthSeconds), detectorRingDecaySeconds: 6 * linewidthSeconds })
    expect(codes(result)).toContain('detector_ringing')
    const plain = analyse({}).result
    expect(result.peaks.length).toBeLessThanOrEqual(plain.peaks.length)
    expect(Math.abs(result.fundamentalFraction - sim.truth.fundamentalFraction)).toBeLessThan(0.02)
  })

  it('when only TEM00 and orders 2 and 3 show, whose mirror image fits as well, then the doubt is said, and the sweep direction settles it', () => {
    // Orders {0, 2, 3} read backwards are {3, 1, 0}: the same places, TEM00 at the other end. Positions cannot decide.
    const powers = [0.3, 0, 0.45, 0.25]
    const { sim, result } = analyse({ orderPowers: powers, direction: 'up' })
    expect(codes(result)).toContain('ambiguous_reading')
    // One of the two readings given is the truth (the low-order prior happens to pick the mirror here: 25 % for 30 %).
    const given = [result.fundamentalFraction, result.alternativeReading!.fundamentalFraction]
    expect(Math.min(...given.map((f) => Math.abs(f - sim.truth.fundamentalFraction)))).toBeLessThan(0.01)
    expect(result.warnings.find((w) => w.code === 'ambiguous_reading')!.message).toMatch(/sweepDirection/)
    const told = analyse({ orderPowers: powers, direction: 'up' }, cavity, 'up').result
    expect(Math.abs(told.fundamentalFraction - sim.truth.fundamentalFraction)).toBeLessThan(0.01)
    expect(told.sweep.direction).toBe('up')
  })
})

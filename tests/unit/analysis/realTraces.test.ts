import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { analyzeTrace } from '../../../shared/analysis/analyzeTrace'
import { analysisResultSchema } from '../../../shared/analysis/types'
import { readTrace } from '../../../shared/trace/readTrace'

// Real recordings and what their source's lab notebook says of them: fixtures/real/SOURCES.md.
const root = new URL('../../../fixtures/', import.meta.url)
const load = (name: string) => readTrace(new Uint8Array(readFileSync(new URL(`real/${name}`, root))))
const cavity = (name: string) => JSON.parse(readFileSync(new URL(`cavities/${name}`, root), 'utf8'))

describe('real trace: plano-concave, L = 150 mm = R/2', () => {
  const result = analyzeTrace(load('planoconcave_633nm_L150mm_R300mm_ramp_2ch.csv'), cavity('planoconcave-633-L150.json'))
  const codes = result.warnings.map((w) => w.code)

  it('when analysed then the result matches the published schema', () => {
    expect(analysisResultSchema.safeParse(result).success).toBe(true)
  })
  it('when the rising sweep is read then the mean TEM00 spacing is within 5 % of the notebook 2.10 ms', () => {
    // Source's lab notebook: one FSR = 2.10 ± 0.02 ms on this trace; single intervals 1.9–2.3 ms (nonlinear piezo).
    expect(Math.abs(result.fsr.meanSpacingSeconds! - 2.1e-3) / 2.1e-3).toBeLessThan(0.05)
    expect(result.fsr.spacingRangeSeconds![0]).toBeGreaterThan(1.8e-3)
    expect(result.fsr.spacingRangeSeconds![1]).toBeLessThan(2.4e-3)
  })
  it('when the ramp turns then the resonance after the turn is dropped', () => {
    // The ramp peaks near t = 8.7 ms (sample ~2160); a resonance at ~10.7 ms lies on the way back.
    expect(result.sweep.rampDirection).toBe('rising')
    expect(result.sweep.endTime).toBeLessThan(9e-3)
    expect(result.peaks.every((p) => p.t < 9e-3)).toBe(true)
  })
  it('when L = R/2 then transverse orders are looked for at quarter-FSR spacing (ψ = π/4)', () => {
    // Half-confocal plano-concave cavity: ψ = π/4 (OPTICS-CHECKS 2(a), Siegman "Lasers" (1986) ch. 19).
    expect(result.gouy.predictedOneWayRad).toBeCloseTo(Math.PI / 4, 6)
  })
  it('when ψ = π/4 then only orders 0–3 are reported: orders N and N + 4 coincide and are merged into the lower', () => {
    // N·ψ/π mod 1 with ψ = π/4 repeats every 4 orders (Siegman, "Lasers" (1986), ch. 19): families 0/4/8, 1/5/9, 2/6/10, 3/7.
    const reported = Object.keys(result.orders).map(Number)
    expect(reported).toContain(0)
    expect(reported.every((order) => order >= 0 && order <= 3)).toBe(true)
    expect(result.peaks.every((p) => p.order === null || p.order <= 3)).toBe(true)
    // A refined Gouy phase stays within its bound of the prediction (3 %), not wandering to explain noise.
    expect(Math.abs(result.gouy.measuredOneWayRad! / (Math.PI / 4) - 1)).toBeLessThanOrEqual(0.03 + 1e-9)
  })
  it('when ψ = π/4 makes the order pattern symmetric then the direction is said to rest on the low-order prior, not on positions', () => {
    // Offsets N·ψ/π mod 1 = 0.25, 0.5, 0.75 mirror onto themselves (orders 1 and 3 swap) when the sweep is reversed
    // (Siegman, "Lasers" (1986), ch. 19); a rising ramp may lengthen or shorten the cavity, so positions cannot decide.
    expect(result.sweep.direction).toBe('down')
    expect(result.sweep.directionEvidence).toMatch(/both directions about equally/)
    // The strong transverse family sits about a quarter FSR before each TEM00 in time: order 1 when frequency falls.
    expect(result.orders['1']).toBeGreaterThan(0.05)
    expect(result.orders['3'] ?? 0).toBeLessThan(result.orders['1'])
  })
  it('when the peaks are 4–7 samples wide and heights vary threefold then it warns of both', () => {
    expect(codes).toContain('undersampled')
    expect(codes).toContain('unsteady_fundamental')
    expect(result.measure).toBe('area')
  })
  it('when analysed then the TEM00 fraction is a number between 0 and 1 and the finesse is the notebook order of magnitude', () => {
    // Notebook: measured finesse 42.8 ± 10.5 at L = 150 mm.
    expect(result.fundamentalFraction).toBeGreaterThan(0.3)
    expect(result.fundamentalFraction).toBeLessThan(1)
    expect(result.finesse!).toBeGreaterThan(25)
    expect(result.finesse!).toBeLessThan(70)
  })
})

describe('real trace: plano-concave, L = 295 mm, near the stability edge', () => {
  it('when analysed then it warns of near-degenerate orders', () => {
    const result = analyzeTrace(load('planoconcave_633nm_L295mm_R300mm_stability_edge_2ch.csv'), cavity('planoconcave-633-L295.json'))
    expect(result.warnings.map((w) => w.code)).toContain('degenerate_orders')
  })
})

describe('bad input', () => {
  const trace = load('planoconcave_633nm_L150mm_R300mm_ramp_2ch.csv')
  it('when the cavity is unstable then unstable_cavity is thrown', () => {
    // g1 g2 = (1 − 300/100)·1 < 0: unstable (Kogelnik & Li, Appl. Opt. 5, 1550 (1966)).
    expect(() => analyzeTrace(trace, { wavelengthNm: 632.8, lengthMm: 300, roc1Mm: null, roc2Mm: 100 })).toThrow(
      expect.objectContaining({ code: 'unstable_cavity' }),
    )
  })
  it('when the transmission is constant then constant_signal is thrown', () => {
    const flat = { ...trace, channels: trace.channels.map((c) => ({ ...c, values: new Float64Array(c.values.length).fill(0.1) })) }
    expect(() => analyzeTrace(flat, cavity('planoconcave-633-L150.json'))).toThrow(expect.objectContaining({ code: 'constant_signal' }))
  })
  it('when the transmission is only noise then no_resonances is thrown', () => {
    let s = 1
    const noisy = new Float64Array(trace.sampleCount).map(() => ((s = (s * 16807) % 2147483647) / 2147483647 - 0.5) * 0.01)
    const quiet = { ...trace, channels: trace.channels.map((c) => (c.role === 'ramp' ? c : { ...c, values: noisy })) }
    expect(() => analyzeTrace(quiet, cavity('planoconcave-633-L150.json'))).toThrow(expect.objectContaining({ code: 'no_resonances' }))
  })
})

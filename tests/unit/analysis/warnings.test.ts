import { describe, expect, it } from 'vitest'
import { analyzeTrace } from '../../../shared/analysis/analyzeTrace'
import { collectWarnings, type WarningInputs } from '../../../shared/analysis/collectWarnings'
import type { AnalysisResult } from '../../../shared/analysis/types'
import { computeCavityModel, type CavityGeometry } from '../../../shared/cavity'
import type { OrderLabel } from '../../../shared/orders/assignOrders'
import type { MeasuredResonance } from '../../../shared/peaks/measureResonances'
import { generateSweptTrace, simPresets } from '../../../shared/sim'
import { traceFromSim } from './traceFromSim'

/** Each warning with a case where it must fire and one where it must not. */

const codes = (result: AnalysisResult | ReturnType<typeof collectWarnings>) => ('warnings' in result ? result.warnings : result).map((w) => w.code)
const messageOf = (warnings: ReturnType<typeof collectWarnings>, code: string) => warnings.find((w) => w.code === code)?.message ?? ''

/** Samples per TEM00 linewidth in the hand-made records. */
const FWHM = 10

/** A measured resonance as measureResonances gives it (a clean, fitted Lorentzian). */
function resonance(centerIndex: number, heightV: number): MeasuredResonance {
  const area = (Math.PI / 2) * heightV * FWHM
  return { centerIndex, heightV, heightErrorV: 1e-4, fwhmSamples: FWHM, fwhmErrorSamples: 0.1, areaVSamples: area, areaErrorVSamples: 1e-3, fitted: true, reducedChiSquare: 1, lobeCount: 1, maxV: heightV }
}
const carrier = (order: number): OrderLabel => ({ kind: 'carrier', order, residualFsr: 0 })
const unassigned: OrderLabel = { kind: 'unassigned', order: null, residualFsr: NaN }

/**
 * Inputs of collectWarnings for resonances on a small hand-made record: Lorentzians of FWHM 10 samples on a flat
 * baseline with a little noise, a plano-concave cavity, finesse 1000. Anything else is overridden per test.
 */
function inputsFor(resonances: { at: number; heightV: number; label: OrderLabel }[], extra: Partial<WarningInputs> = {}): WarningInputs {
  const n = 10_000
  const signal = new Float64Array(n)
  for (const r of resonances) {
    for (let i = 0; i < n; i++) signal[i] += r.heightV / (1 + ((i - r.at) / (FWHM / 2)) ** 2)
  }
  let s = 7
  for (let i = 0; i < n; i++) signal[i] += 1e-3 * (((s = (s * 16807) % 2147483647) / 2147483647) - 0.5)
  const measured = resonances.map((r) => resonance(r.at, r.heightV))
  const labels = resonances.map((r) => r.label)
  const model = computeCavityModel({ wavelengthNm: 1064, lengthMm: 100, roc1Mm: null, roc2Mm: 500 })
  return {
    part: signal,
    signal,
    sigmaV: 3e-4,
    quantumV: 0,
    measured,
    labels,
    fundamentals: labels.flatMap((l, i) => (l.kind === 'carrier' && l.order === 0 ? [i] : [])),
    samplesPerLinewidth: FWHM,
    gouyRad: model.gouyOneWayRad,
    linewidthFsr: 1e-3,
    resolutionFsr: 0,
    orders: { 0: 0.8, 1: 0.1, 2: 0.1 },
    orderResidualRmsFsr: 1e-4,
    calibrated: true,
    sweepSpeed: 0.01,
    ringdownFinesse: null,
    spikeTrains: false,
    ...extra,
  }
}

/** Three TEM00 4000 samples apart with orders 1 and 2 between them (the plain case: no warning expected). */
const ladder = [
  { at: 1000, heightV: 1, label: carrier(0) },
  { at: 1800, heightV: 0.1, label: carrier(1) },
  { at: 2600, heightV: 0.1, label: carrier(2) },
  { at: 5000, heightV: 1, label: carrier(0) },
  { at: 5800, heightV: 0.1, label: carrier(1) },
  { at: 6600, heightV: 0.1, label: carrier(2) },
  { at: 9000, heightV: 1, label: carrier(0) },
]

describe('the hand-made record itself', () => {
  it('when three TEM00 and their orders are all assigned then no warning is raised', () => {
    expect(codes(collectWarnings(inputsFor(ladder)))).toEqual([])
  })
})

describe('degenerate_orders', () => {
  // Near-confocal: g = 1 − L/R = 0.01, ψ = arccos(g) ≈ 0.4968 π, so order 2 sits 2ψ/π − 1 ≈ −0.0064 FSR from TEM00
  // (order N at N·ψ/π mod 1, Siegman, "Lasers" (1986), ch. 19): 25 linewidths at finesse 4000, 35 at 5500, 1.9 at 300.
  const nearConfocal: CavityGeometry = { wavelengthNm: 1064, lengthMm: 99, roc1Mm: 100, roc2Mm: 100 }
  const gouyOneWayRad = computeCavityModel(nearConfocal).gouyOneWayRad
  const analyse = (finesse: number, seed: number) => {
    const sim = generateSweptTrace({
      cavity: nearConfocal, gouyOneWayRad, finesse, orderPowers: [0.8, 0.08, 0.07, 0.03, 0.02], fsrCount: 2.5,
      sampleCount: Math.round((2.5 * finesse * 12) / 0.9), noiseFraction: 0.003, seed,
    })
    return analyzeTrace(traceFromSim(sim), nearConfocal)
  }

  it.each([4000, 5500])('when a near-confocal cavity of finesse %s keeps its lines 25–35 linewidths apart then it does not fire', (finesse) => {
    expect(codes(analyse(finesse, 1))).not.toContain('degenerate_orders')
  })

  it('when the same near-confocal cavity has finesse 300 (lines 1.9 linewidths apart) then it fires and names orders 0 and 2 first', () => {
    const message = analyse(300, 1).warnings.find((w) => w.code === 'degenerate_orders')?.message ?? ''
    expect(message).toMatch(/orders 0 and 2 \((1\.[5-9]|2\.[01]) linewidths/)
    expect(message).toMatch(/TEM00 fraction may include a transverse order/)
  })

  it('when ψ/π = 0.3334 at finesse 1000 then it names the pairs three orders apart that carry power, 0.2 linewidths apart, and not the powerless 3 and 6', () => {
    // 3ψ/π = 1.0002: orders N and N + 3 stand 0.0002 FSR = 0.2 linewidths apart.
    const message = messageOf(collectWarnings(inputsFor(ladder, { gouyRad: 0.3334 * Math.PI, linewidthFsr: 1e-3, orders: { 0: 0.8, 1: 0.1, 2: 0.1 } })), 'degenerate_orders')
    expect(message).toMatch(/orders 0 and 3 \(0\.2 linewidths, 0\.00020 FSR\), 1 and 4 \(0\.2 linewidths, 0\.00020 FSR\), 2 and 5 \(0\.2 linewidths/)
    expect(message).not.toMatch(/3 and 6/)
  })

  it('when ψ/π = 0.34 at finesse 1000 (orders three apart stand 20 linewidths apart) then it does not fire', () => {
    expect(codes(collectWarnings(inputsFor(ladder, { gouyRad: 0.34 * Math.PI, linewidthFsr: 1e-3 })))).not.toContain('degenerate_orders')
  })
})

describe('many_unassigned', () => {
  it('when the unassigned resonances sit 1–3 linewidths beside assigned ones (split or twice-found lines) then it names fragments, not the geometry', () => {
    const fragments = [
      { at: 1015, heightV: 0.3, label: unassigned },
      { at: 1815, heightV: 0.04, label: unassigned },
      { at: 5030, heightV: 0.2, label: unassigned },
      { at: 6585, heightV: 0.04, label: unassigned },
    ]
    const message = messageOf(collectWarnings(inputsFor([...ladder, ...fragments])), 'many_unassigned')
    expect(message).toMatch(/^4 of 11 resonances match no predicted order; all sit within 5 linewidths of an assigned resonance: they are likely fragments/)
    expect(message).not.toMatch(/Check the cavity length/)
  })

  it('when the unassigned resonances stand far from every assigned one then it points at the geometry', () => {
    const strays = [
      { at: 3300, heightV: 0.05, label: unassigned },
      { at: 4100, heightV: 0.05, label: unassigned },
      { at: 7300, heightV: 0.05, label: unassigned },
      { at: 8100, heightV: 0.05, label: unassigned },
    ]
    const message = messageOf(collectWarnings(inputsFor([...ladder, ...strays])), 'many_unassigned')
    expect(message).toMatch(/Check the cavity length and mirror radii/)
    expect(message).not.toMatch(/fragments/)
  })

  it('when only two of nine resonances are unassigned then it does not fire', () => {
    const two = [
      { at: 3300, heightV: 0.05, label: unassigned },
      { at: 7300, heightV: 0.05, label: unassigned },
    ]
    expect(codes(collectWarnings(inputsFor([...ladder, ...two])))).not.toContain('many_unassigned')
  })
})

describe('two_fundamentals', () => {
  const twoTem00 = ladder.slice(0, 6)

  it('when exactly two TEM00 are in the record then it fires', () => {
    expect(codes(collectWarnings(inputsFor(twoTem00)))).toContain('two_fundamentals')
  })

  it('when three TEM00 are in the record but the calibration used only two of them then it does not fire', () => {
    const inputs = inputsFor(ladder)
    // The third TEM00 (index 6) is labelled order 0 by the assignment but left out of the calibration's list.
    const result = collectWarnings({ ...inputs, fundamentals: [0, 3] })
    expect(codes(result)).not.toContain('two_fundamentals')
    expect(codes(result)).not.toContain('single_fundamental')
  })

  it('when one of two TEM00 was found twice (two detections 3 samples apart) then it still fires', () => {
    const twice = [...twoTem00, { at: 1003, heightV: 0.9, label: carrier(0) }]
    const inputs = inputsFor(twice)
    expect(inputs.fundamentals).toHaveLength(3)
    expect(codes(collectWarnings(inputs))).toContain('two_fundamentals')
  })

  it('when a short line at the sweep edge is labelled order 0 beside two tall TEM00 then it still fires', () => {
    // One laser feeds every TEM00 of a sweep alike: a line at a tenth of their height is a transverse order read off.
    const edge = [...twoTem00, { at: 9500, heightV: 0.09, label: carrier(0) }]
    expect(codes(collectWarnings({ ...inputsFor(edge), fundamentals: [0, 3] }))).toContain('two_fundamentals')
  })

  it.each([
    { seed: 1, tem00: 2, fires: true },
    { seed: 3, tem00: 3, fires: false },
  ])('when a generated reference trace holds $tem00 TEM00 (seed $seed) then two_fundamentals fires: $fires', ({ seed, tem00, fires }) => {
    const preset = simPresets['reference-1064']
    const sim = generateSweptTrace({ ...preset, seed })
    const result = analyzeTrace(traceFromSim(sim), preset.cavity!)
    const inSweep = sim.truth.peaks.filter((p) => p.kind === 'carrier' && p.order === 0 && p.t >= result.sweep.startTime && p.t <= result.sweep.endTime)
    expect(inSweep).toHaveLength(tem00)
    expect(codes(result).includes('two_fundamentals')).toBe(fires)
  })
})

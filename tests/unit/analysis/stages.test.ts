import { describe, expect, it } from 'vitest'
import { selectSweep } from '../../../shared/sweep/selectSweep'
import { estimateNoise } from '../../../shared/peaks/estimateNoise'
import { estimateBaseline } from '../../../shared/peaks/estimateBaseline'
import { findResonances } from '../../../shared/peaks/findResonances'
import { calibrateSweep, frequencyAt } from '../../../shared/calibration/calibrateSweep'
import { findFundamentals } from '../../../shared/orders/findFundamentals'
import { assignOrders } from '../../../shared/orders/assignOrders'

/** Deterministic Gaussian noise (Box–Muller on a linear congruential generator; common practice). */
function noise(seed: number): () => number {
  let s = seed >>> 0
  const u = () => ((s = (1664525 * s + 1013904223) >>> 0) + 0.5) / 4294967296
  return () => Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u())
}

function lorentzian(x: number, center: number, height: number, fwhm: number): number {
  return height / (1 + ((2 * (x - center)) / fwhm) ** 2)
}

describe('selectSweep', () => {
  it('when a sawtooth ramp has a flyback then the longest rising part is kept', () => {
    const n = 1000
    const ramp = new Float64Array(n)
    for (let i = 0; i < n; i++) ramp[i] = i < 100 ? 1 - i / 100 : (i - 100) / 900
    const s = selectSweep(ramp, n, { guardSamples: 0 })
    expect(s.rampDirection).toBe('rising')
    expect(s.startIndex).toBeGreaterThanOrEqual(95)
    expect(s.startIndex).toBeLessThanOrEqual(110)
    expect(s.endIndex).toBe(n)
  })
  it('when a triangle ramp turns then the longer half is chosen with its direction', () => {
    const n = 1000
    const ramp = new Float64Array(n)
    for (let i = 0; i < n; i++) ramp[i] = i < 400 ? i / 400 : 1 - (i - 400) / 600
    const s = selectSweep(ramp, n)
    expect(s.rampDirection).toBe('falling')
    expect(s.startIndex).toBeGreaterThan(395)
    expect(s.endIndex).toBe(n)
  })
  it('when there is no ramp then the whole record is used', () => {
    expect(selectSweep(null, 50)).toMatchObject({ startIndex: 0, endIndex: 50, rampDirection: 'unknown' })
  })
})

describe('estimateNoise and estimateBaseline', () => {
  it('when white noise of σ = 0.01 sits on 0.2 V with sparse peaks then both come back within 5 %', () => {
    const n = 20000
    const g = noise(7)
    const y = new Float64Array(n)
    for (let i = 0; i < n; i++) y[i] = 0.2 + 0.01 * g() + lorentzian(i, 5000, 1, 20) + lorentzian(i, 15000, 0.5, 20)
    const { sigmaV } = estimateNoise(y)
    // MAD of first differences / √2 (common practice).
    expect(sigmaV).toBeGreaterThan(0.0095)
    expect(sigmaV).toBeLessThan(0.0105)
    const { darkLevelV } = estimateBaseline(y, sigmaV)
    expect(Math.abs(darkLevelV - 0.2)).toBeLessThan(0.001)
  })
})

describe('findResonances', () => {
  it('when two peaks stand 20σ and 8σ out of the noise then both are found, the noise is not', () => {
    const n = 5000
    const g = noise(3)
    const y = new Float64Array(n)
    for (let i = 0; i < n; i++) y[i] = 0.01 * g() + lorentzian(i, 1000, 0.2, 10) + lorentzian(i, 3000, 0.08, 10)
    const found = findResonances(y, 0.01)
    expect(found.map((f) => f.peakIndex)).toEqual([expect.closeTo(1000, -1), expect.closeTo(3000, -1)])
  })
  it('when a resonance carries a decaying oscillation after it then no lobe above 5 % becomes a resonance of its own', () => {
    // Ringing after a fast crossing (Poirson et al., J. Opt. Soc. Am. B 14, 2811 (1997)): modelled as a damped chirp.
    const n = 2000
    const y = new Float64Array(n)
    for (let i = 0; i < n; i++) {
      const dt = i - 1000
      y[i] = lorentzian(i, 1000, 1, 6) + (dt > 3 ? 0.6 * Math.exp(-dt / 12) * Math.cos(0.02 * dt * dt) ** 2 : 0)
    }
    const found = findResonances(y, 0.001)
    expect(found[0].lobeCount).toBeGreaterThanOrEqual(3)
    // Known limit: the faint end of the tail (below 2 % of the peak) may still come out as small separate maxima.
    expect(found.slice(1).every((f) => f.maxV < 0.05)).toBe(true)
  })
})

describe('calibrateSweep', () => {
  it('when TEM00 times follow a ±10 % nonlinear sweep then the cubic maps every one back to its FSR index', () => {
    const index = [0, 1, 2, 3, 4, 5]
    // Invert ν(t) = t + 0.1·sin(t) numerically for each index (a smooth piezo nonlinearity, common practice).
    const times = index.map((k) => {
      let t = k
      for (let i = 0; i < 50; i++) t = k - 0.1 * Math.sin(t / 2)
      return t
    })
    const cal = calibrateSweep(times, index)
    expect(cal.polynomialOrder).toBe(3)
    expect(cal.residualRmsFsr).toBeLessThan(0.01)
    expect(frequencyAt(cal, times[3])).toBeCloseTo(3, 2)
  })
})

describe('findFundamentals and assignOrders', () => {
  it('when tall peaks repeat every 100 samples with smaller ones between then the tall ones form the comb', () => {
    const peaks = [0, 1, 2, 3].flatMap((k) => [
      { center: 100 * k + 3 * k * k, height: 1 },
      { center: 100 * k + 3 * k * k + 25, height: 0.1 },
    ])
    const comb = findFundamentals(peaks)
    expect(comb.members).toEqual([0, 2, 4, 6])
    expect(comb.fsrIndex).toEqual([0, 1, 2, 3])
  })
  it('when the spectrum is mirrored (sweep down) then the down direction is chosen and orders stay right', () => {
    // ψ = π/4 gives orders at 0.25, 0.5, 0.75 FSR (Siegman, "Lasers" (1986), ch. 19; OPTICS-CHECKS 2(a) half-confocal).
    const psi = 0.6
    const placed = [1, 2, 3].map((order) => ({ positionFsr: -((order * psi) / Math.PI), weight: 0.1 / order, fundamental: false }))
    placed.push({ positionFsr: 0, weight: 1, fundamental: true })
    const result = assignOrders(placed, psi)
    expect(result.direction).toBe('down')
    expect(result.labels.map((l) => l.order)).toEqual([1, 2, 3, 0])
    // ψ = 0.6 is no simple fraction of π: the positions alone decide, and the result says so.
    expect(result.directionEvidence).toMatch(/sit at their predicted places for down/)
  })
  it('when a peak sits at f_mod/FSR beside TEM00 then it is labelled a sideband, not a carrier', () => {
    const placed = [
      { positionFsr: 0, weight: 1, fundamental: true },
      { positionFsr: 0.03, weight: 0.05, fundamental: false },
      { positionFsr: 0.3, weight: 0.05, fundamental: false },
    ]
    const result = assignOrders(placed, 0.3 * Math.PI, { sidebandOffsetFsr: 0.03 })
    expect(result.labels.map((l) => l.kind)).toEqual(['carrier', 'sideband', 'carrier'])
  })
})

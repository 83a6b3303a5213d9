import { describe, expect, it } from 'vitest'
import { estimateNoise } from '../../../shared/peaks/estimateNoise'

/** Quantisation noise of a uniform quantiser of step q: q/√12 (Bennett, Bell Syst. Tech. J. 27, 446 (1948)). */
const quantisationNoise = (q: number) => q / Math.sqrt(12)

/** Deterministic standard normal draws (Box–Muller on a linear congruential generator). */
function normal(seed: number): () => number {
  let s = seed >>> 0
  const uniform = () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) + 0.5) / 2 ** 32
  return () => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform())
}

/** n samples on the code `baseCode`, with sparse Lorentzian peaks (height in codes), noise added, rounded to the grid. */
function quantisedRecord(q: number, { n = 20_000, spacing = 5000, baseCode = 3, heightCodes = 200, fwhm = 20, noiseV = 0, seed = 1 } = {}): Float64Array {
  const g = normal(seed)
  const y = new Float64Array(n)
  for (let i = 0; i < n; i++) {
    const x = ((i % spacing) - spacing / 2) / (fwhm / 2)
    const v = baseCode * q + (heightCodes * q) / (1 + x * x) + noiseV * g()
    y[i] = Math.round(v / q) * q
  }
  return y
}

describe('estimateNoise on quantised records', () => {
  const q = 0.004

  it('when a quiet baseline sits exactly on one code (every difference off the peaks is 0) then σ = q/√12 and the step is found', () => {
    const y = new Float64Array(20_000).fill(3 * q)
    // The peaks' wings stand below half a step over most of the record, so the baseline holds one code.
    for (let i = 0; i < y.length; i++) {
      const x = ((i % 1000) - 500) / 2
      y[i] = Math.round((3 * q + (200 * q) / (1 + x * x)) / q) * q
    }
    let zeros = 0
    for (let i = 1; i < y.length; i++) if (y[i] === y[i - 1]) zeros++
    expect(zeros / (y.length - 1)).toBeGreaterThan(0.9)
    const { sigmaV, quantumV } = estimateNoise(y, { stride: 1 })
    expect(quantumV).toBeCloseTo(q, 12)
    expect(sigmaV).toBeCloseTo(quantisationNoise(q), 12)
  })

  it('when one sample lies off the grid (a glitch of 1 µV) then the step is still found and σ stays at q/√12', () => {
    const y = quantisedRecord(q)
    y[10_123] += 1e-6
    const { sigmaV, quantumV } = estimateNoise(y, { stride: 1 })
    expect(quantumV / q).toBeCloseTo(1, 6)
    expect(sigmaV).toBeGreaterThanOrEqual(quantisationNoise(q) * (1 - 1e-6))
  })

  it('when steep flanks skip codes (no difference is a single step) then the common step is found, not the smallest difference', () => {
    // Differences of 2q and 3q only: their greatest common step is q.
    const pattern = [0, 2, 5, 7, 10, 12, 15, 12, 10, 7, 5, 2]
    const y = Float64Array.from({ length: 6000 }, (_, i) => (i % 60 < pattern.length ? pattern[i % 60] : 0) * q)
    const { sigmaV, quantumV } = estimateNoise(y, { stride: 1 })
    expect(quantumV).toBeCloseTo(q, 12)
    expect(sigmaV).toBeGreaterThanOrEqual(quantisationNoise(q))
  })

  it('when the values were printed with four decimals (steps of 0.0049 read as 0.0049 or 0.0048) then the step comes back within 0.5 %', () => {
    const step = 0.0048913
    const y = quantisedRecord(step).map((v) => Math.round(v * 1e4) / 1e4)
    const { sigmaV, quantumV } = estimateNoise(y, { stride: 1 })
    expect(Math.abs(quantumV / step - 1)).toBeLessThan(0.005)
    expect(sigmaV).toBeGreaterThanOrEqual(0.995 * quantisationNoise(step))
  })

  it('when the noise is half a step to 1.5 steps then σ follows √(σn² + q²/12) within 12 % instead of jumping with the median code', () => {
    // Noise of q/2 or more makes the quantisation error nearly uniform and independent of the signal, so the two add
    // in quadrature (Widrow & Kollár, "Quantization Noise" (2008), ch. 4–5).
    for (const noiseCodes of [0.5, 0.7, 1, 1.5]) {
      const y = quantisedRecord(q, { noiseV: noiseCodes * q, seed: 5 })
      const expected = Math.hypot(noiseCodes * q, quantisationNoise(q))
      const { sigmaV } = estimateNoise(y, { stride: 1 })
      // The median of whole-step differences alone read 0.50, 1.39, 1.01 and 0.69 of it here.
      expect(Math.abs(sigmaV / expected - 1)).toBeLessThan(0.12)
    }
  })

  it('when the samples sit on no grid (white noise in floating point) then no step is reported and σ is the MAD estimate', () => {
    const g = normal(9)
    const y = Float64Array.from({ length: 20_000 }, () => 0.2 + 0.01 * g())
    const { sigmaV, quantumV } = estimateNoise(y, { stride: 1 })
    expect(quantumV).toBe(0)
    expect(Math.abs(sigmaV / 0.01 - 1)).toBeLessThan(0.05)
  })

  it('when the noise spans many codes (16 bits) then σ is the white noise within 5 % and the floor plays no part', () => {
    const step = 1e-5
    const y = quantisedRecord(step, { noiseV: 100 * step, heightCodes: 20_000, seed: 3 })
    const { sigmaV } = estimateNoise(y, { stride: 1 })
    expect(Math.abs(sigmaV / (100 * step) - 1)).toBeLessThan(0.05)
  })
})

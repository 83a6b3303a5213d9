import { describe, expect, it } from 'vitest'
import { fitPeakGroup, type PeakGroupFit } from '../../../shared/fit'
import { EngineError } from '../../../shared/errors'

// Synthetic data with known answers. Line shapes: Lorentzian limit and Airy function of a Fabry–Perot,
// Born & Wolf, "Principles of Optics", §7.6. Area of a Lorentzian π·h·FWHM/2: elementary integral.

const lorentzian = (x: number, c: number, h: number, w: number) => h / (1 + ((2 * (x - c)) / w) ** 2)
const airy = (x: number, c: number, h: number, w: number, period: number) =>
  h / (1 + ((2 * period) / (Math.PI * w)) ** 2 * Math.sin((Math.PI * (x - c)) / period) ** 2)
const grid = (start: number, step: number, count: number) => Array.from({ length: count }, (_, i) => start + i * step)

/** Small deterministic generator (Numerical Recipes LCG constants) with Box–Muller normal deviates. */
function normalNoise(seed: number): () => number {
  let state = seed >>> 0
  const uniform = () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0
    return (state + 0.5) / 4294967296
  }
  return () => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform())
}

describe('fitPeakGroup with a Lorentzian', () => {
  it('when one noiseless peak on a time axis is fitted then centre, height, FWHM, baseline and area are exact', () => {
    const c = 1e-3 + 25.3e-7
    const x = grid(1e-3, 2e-7, 50)
    const y = x.map((v) => 0.02 + lorentzian(v, c, 1.5, 1.1e-6))
    const fit = fitPeakGroup(x, y, [{ center: 1e-3 + 24e-7, height: 1.2, fwhm: 1.5e-6 }])
    expect(fit.converged).toBe(true)
    expect(fit.model).toBe('lorentzian')
    const [peak] = fit.peaks
    expect(peak.center).toBeCloseTo(c, 15)
    expect(peak.height).toBeCloseTo(1.5, 10)
    expect(peak.fwhm / 1.1e-6).toBeCloseTo(1, 10)
    expect(fit.baseline).toBeCloseTo(0.02, 10)
    expect(peak.area / ((Math.PI * 1.5 * 1.1e-6) / 2)).toBeCloseTo(1, 10)
  })

  it('when two peaks overlap at one FWHM separation then both are recovered', () => {
    const x = grid(0, 0.05, 200)
    const y = x.map((v) => 0.1 + lorentzian(v, 4.6, 1, 0.8) + lorentzian(v, 5.4, 0.4, 0.8))
    // Guesses off by a fair fraction, as a peak finder on blended peaks would give.
    const fit = fitPeakGroup(x, y, [
      { center: 4.5, height: 1.1, fwhm: 1.0 },
      { center: 5.6, height: 0.3, fwhm: 0.6 },
    ])
    expect(fit.converged).toBe(true)
    expect(fit.peaks[0].center).toBeCloseTo(4.6, 8)
    expect(fit.peaks[1].center).toBeCloseTo(5.4, 8)
    expect(fit.peaks[0].height).toBeCloseTo(1, 8)
    expect(fit.peaks[1].height).toBeCloseTo(0.4, 8)
    expect(fit.peaks[1].fwhm).toBeCloseTo(0.8, 8)
  })

  for (const samplesPerFwhm of [2, 3, 4]) {
    it(`when the peak is undersampled (${samplesPerFwhm} samples per FWHM) then height and area are both kept`, () => {
      const fwhm = 1
      const step = fwhm / samplesPerFwhm
      // Offset the centre by a third of a sample so no sample sits on the top.
      const c = 10 + step / 3
      const x = grid(0, step, Math.round(20 / step))
      const y = x.map((v) => lorentzian(v, c, 2, fwhm) + 0.05)
      const maxSample = Math.max(...y) - 0.05
      const fit = fitPeakGroup(x, y, [{ center: 10, height: maxSample, fwhm: 1.5 * step }])
      expect(fit.converged).toBe(true)
      expect(maxSample).toBeLessThan(2) // the tallest sample under-reads the true height …
      expect(fit.peaks[0].height).toBeCloseTo(2, 8) // … and the fit restores it
      expect(fit.peaks[0].area).toBeCloseTo(Math.PI, 8)
      expect(fit.peaks[0].center).toBeCloseTo(c, 8)
    })
  }

  it('when the baseline is fixed then it is not fitted and its error is 0', () => {
    const x = grid(-5, 0.1, 101)
    const y = x.map((v) => 0.3 + lorentzian(v, 0.2, 1, 1))
    const fit = fitPeakGroup(x, y, [{ center: 0, height: 1, fwhm: 1.3 }], { fixedBaseline: 0.3 })
    expect(fit.baseline).toBe(0.3)
    expect(fit.baselineError).toBe(0)
    expect(fit.peaks[0].center).toBeCloseTo(0.2, 8)
  })

  it('when noise of known sigma is added then the reported errors match the scatter over repeated draws (common practice check)', () => {
    const sigma = 0.02
    const x = grid(0, 0.05, 200)
    const truth = { c1: 4.6, h1: 1, w1: 0.8, c2: 5.5, h2: 0.5, w2: 0.7, base: 0.1 }
    const draws = 300
    const samples: PeakGroupFit[] = []
    const noise = normalNoise(20261201)
    for (let k = 0; k < draws; k++) {
      const y = x.map(
        (v) => truth.base + lorentzian(v, truth.c1, truth.h1, truth.w1) + lorentzian(v, truth.c2, truth.h2, truth.w2) + sigma * noise(),
      )
      samples.push(
        fitPeakGroup(x, y, [
          { center: 4.5, height: 0.9, fwhm: 1 },
          { center: 5.6, height: 0.6, fwhm: 0.6 },
        ], { noiseSigma: sigma }),
      )
    }
    expect(samples.every((s) => s.converged)).toBe(true)
    const spread = (values: number[]) => {
      const mean = values.reduce((a, b) => a + b) / values.length
      return Math.sqrt(values.reduce((a, v) => a + (v - mean) ** 2, 0) / (values.length - 1))
    }
    const checks: Array<[string, (f: PeakGroupFit) => number, (f: PeakGroupFit) => number]> = [
      ['center 1', (f) => f.peaks[0].center, (f) => f.peaks[0].errors.center],
      ['height 1', (f) => f.peaks[0].height, (f) => f.peaks[0].errors.height],
      ['fwhm 2', (f) => f.peaks[1].fwhm, (f) => f.peaks[1].errors.fwhm],
      ['area 1', (f) => f.peaks[0].area, (f) => f.peaks[0].errors.area],
      ['area 2', (f) => f.peaks[1].area, (f) => f.peaks[1].errors.area],
      ['baseline', (f) => f.baseline, (f) => f.baselineError],
    ]
    for (const [, value, error] of checks) {
      const observed = spread(samples.map(value))
      const reported = samples.map(error).reduce((a, b) => a + b) / draws
      // With 300 draws the sample standard deviation is known to about ±4 % (1σ); allow 15 %.
      expect(Math.abs(observed / reported - 1)).toBeLessThan(0.15)
    }
    const meanChi2 = samples.reduce((a, s) => a + s.reducedChiSquare, 0) / draws
    expect(meanChi2).toBeGreaterThan(0.97)
    expect(meanChi2).toBeLessThan(1.03)
  })
})

describe('fitPeakGroup with the Airy function', () => {
  it('when a low-finesse periodic peak is fitted then finesse and area over one period are exact', () => {
    const period = 3
    const finesse = 12
    const x = grid(0, 0.05, 200)
    const y = x.map((v) => 0.05 + airy(v, 5, 1, period / finesse, period))
    const fit = fitPeakGroup(x, y, [{ center: 5.1, height: 0.8, fwhm: 0.3 }], { model: 'airy', period })
    expect(fit.converged).toBe(true)
    expect(fit.model).toBe('airy')
    expect(period / fit.peaks[0].fwhm).toBeCloseTo(finesse, 8)
    // Area over one period, checked against a direct midpoint-rule integral of the same function.
    const steps = 100000
    let integral = 0
    for (let i = 0; i < steps; i++) integral += airy(5 + ((i + 0.5) / steps - 0.5) * period, 5, 1, period / finesse, period)
    integral *= period / steps
    expect(fit.peaks[0].area).toBeCloseTo(integral, 8)
  })

  it('when an Airy peak is fitted with a Lorentzian then the Lorentzian misses and the Airy model does not', () => {
    // Born & Wolf §7.6: the Airy function exceeds its Lorentzian limit in the wings at low finesse.
    const period = 2
    const x = grid(0, 0.02, 200)
    const y = x.map((v) => airy(v, 2, 1, period / 5, period))
    const airyFit = fitPeakGroup(x, y, [{ center: 2, height: 1, fwhm: 0.4 }], { model: 'airy', period })
    const lorentzFit = fitPeakGroup(x, y, [{ center: 2, height: 1, fwhm: 0.4 }])
    expect(airyFit.residualSumOfSquares).toBeLessThan(1e-20)
    expect(lorentzFit.residualSumOfSquares).toBeGreaterThan(1e-4)
  })
})

describe('fitPeakGroup input checks', () => {
  it('when the Airy model has no period then it throws invalid_argument naming the period', () => {
    expect(() => fitPeakGroup([1, 2, 3, 4, 5, 6], [0, 1, 2, 1, 0, 0], [{ center: 3, height: 2, fwhm: 1 }], { model: 'airy' })).toThrow(
      "The 'airy' model needs a positive period (the FSR in x units)",
    )
  })

  it('when a guess has a non-positive FWHM then it throws', () => {
    expect(() => fitPeakGroup([1, 2, 3, 4, 5, 6], [0, 1, 2, 1, 0, 0], [{ center: 3, height: 2, fwhm: 0 }])).toThrow(
      'Peak guess 0 must have a positive fwhm, got 0',
    )
  })

  it('when there are no more samples than parameters then it throws too_few_samples', () => {
    try {
      fitPeakGroup([1, 2, 3, 4], [0, 1, 2, 1], [{ center: 3, height: 2, fwhm: 1 }])
      expect.unreachable()
    } catch (error) {
      expect(error).toBeInstanceOf(EngineError)
      expect((error as EngineError).code).toBe('too_few_samples')
    }
  })

  it('when no guesses are given then it throws', () => {
    expect(() => fitPeakGroup([1, 2, 3], [1, 2, 3], [])).toThrow('fitPeakGroup needs at least one peak guess')
  })
})

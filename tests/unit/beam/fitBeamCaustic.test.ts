import { describe, expect, it } from 'vitest'
import { createInputBeam, fitBeamCaustic } from '../../../shared/beam'
import { createRandom } from '../../../shared/sim/createRandom'
import { engineErrorOf } from './helpers'

// Model: ISO 11146-1:2005 hyperbola w(z)² = w0² + (M²λ/(π w0))² (z − z0)² (from memory: the standard's
// fitting section; also Siegman, "Lasers" (1986), ch. 17). Truth values below are invented for the tests.
const lambdaNm = 1064
const truth = { w0: 0.25, z0: 120, m2: 1.3 }
const zR = (Math.PI * truth.w0 ** 2) / (truth.m2 * lambdaNm * 1e-6)
const radius = (z: number, t = truth) => Math.sqrt(t.w0 ** 2 + ((t.m2 * lambdaNm * 1e-6) / (Math.PI * t.w0)) ** 2 * (z - t.z0) ** 2)
/** 20 positions from z0 − 4 z_R to z0 + 4 z_R: about half within 2 z_R, half beyond (ISO 11146-1 layout, from memory). */
const positions = Array.from({ length: 20 }, (_, i) => truth.z0 - 4 * zR + (8 * zR * i) / 19)

describe('fitBeamCaustic', () => {
  it('when the radii are exact then w0, z0 and M² come back to 1e-9', () => {
    const fit = fitBeamCaustic({ wavelengthNm: lambdaNm, zMm: positions, radiusMm: positions.map((z) => radius(z)) })
    expect(fit.waistRadiusMm).toBeCloseTo(truth.w0, 9)
    expect(fit.waistPositionMm).toBeCloseTo(truth.z0, 7)
    expect(fit.m2).toBeCloseTo(truth.m2, 9)
    expect(fit.rayleighRangeMm).toBeCloseTo(zR, 6)
    expect(fit.coefficients.c).toBeCloseTo(((truth.m2 * lambdaNm * 1e-6) / (Math.PI * truth.w0)) ** 2, 12)
    expect(fit.warnings).toEqual([])
  })

  // Coverage over repeated noise draws (common practice for checking an uncertainty estimate): with honest 1σ
  // errors about 68.3 % of the draws fall within ±1σ of the truth; with 400 draws the binomial spread is ±2.3 %,
  // so [0.60, 0.77] is a ±3.5σ acceptance band.
  const coverage = (given: boolean) => {
    const random = createRandom(given ? 11 : 7)
    const hits = { w0: 0, z0: 0, m2: 0 }
    const draws = 400
    let meanM2 = 0
    for (let d = 0; d < draws; d++) {
      const noisy = positions.map((z) => radius(z) * (1 + 0.02 * random.normal()))
      const fit = fitBeamCaustic({
        wavelengthNm: lambdaNm,
        zMm: positions,
        radiusMm: noisy,
        radiusUncertaintyMm: given ? positions.map((z) => 0.02 * radius(z)) : undefined,
      })
      if (Math.abs(fit.waistRadiusMm - truth.w0) <= fit.uncertainty.waistRadiusMm) hits.w0++
      if (Math.abs(fit.waistPositionMm - truth.z0) <= fit.uncertainty.waistPositionMm) hits.z0++
      if (Math.abs(fit.m2 - truth.m2) <= fit.uncertainty.m2) hits.m2++
      meanM2 += fit.m2 / draws
    }
    return { w0: hits.w0 / draws, z0: hits.z0 / draws, m2: hits.m2 / draws, meanM2 }
  }

  // With the scale estimated from 17 degrees of freedom the expected ±1σ coverage is P(|t₁₇| < 1) ≈ 0.67 (Student t).
  it('when 2 % noise is added and the scale is estimated from the scatter then ±1σ covers about 68 % of draws', () => {
    const c = coverage(false)
    for (const share of [c.w0, c.z0, c.m2]) {
      expect(share).toBeGreaterThan(0.6)
      expect(share).toBeLessThan(0.77)
    }
    expect(Math.abs(c.meanM2 - truth.m2)).toBeLessThan(0.01)
  })

  it('when 2 % noise is added and the true uncertainties are given then ±1σ covers about 68 % of draws', () => {
    const c = coverage(true)
    for (const share of [c.w0, c.z0, c.m2]) {
      expect(share).toBeGreaterThan(0.6)
      expect(share).toBeLessThan(0.77)
    }
  })

  it('when every measurement lies after the waist then it warns that the waist is not bracketed', () => {
    const after = positions.filter((z) => z > truth.z0 + 0.5 * zR)
    const fit = fitBeamCaustic({ wavelengthNm: lambdaNm, zMm: after, radiusMm: after.map((z) => radius(z)) })
    expect(fit.warnings.map((w) => w.code)).toContain('waist_not_bracketed')
    expect(fit.waistPositionMm).toBeCloseTo(truth.z0, 5) // exact data still extrapolate correctly
  })

  it('when all points lie near the waist then it warns that none are beyond two Rayleigh ranges', () => {
    const near = Array.from({ length: 12 }, (_, i) => truth.z0 - 0.9 * zR + (1.8 * zR * i) / 11)
    const fit = fitBeamCaustic({ wavelengthNm: lambdaNm, zMm: near, radiusMm: near.map((z) => radius(z)) })
    expect(fit.warnings.map((w) => w.code)).toEqual(['no_points_far_from_waist'])
  })

  it('when the radii imply M² < 1 then it warns that the value is unphysical, and when there are few points it says so', () => {
    const few = positions.filter((_, i) => i % 3 === 0)
    const fit = fitBeamCaustic({ wavelengthNm: lambdaNm, zMm: few, radiusMm: few.map((z) => radius(z, { ...truth, m2: 0.8 })) })
    expect(fit.m2).toBeCloseTo(0.8, 9)
    expect(fit.warnings.map((w) => w.code)).toEqual(expect.arrayContaining(['m2_below_one', 'few_measurements']))
  })

  it('when M² comes out a hair below 1 (a perfect beam and rounded radii) then there is no unphysical-M² warning', () => {
    const fit = fitBeamCaustic({ wavelengthNm: lambdaNm, zMm: positions, radiusMm: positions.map((z) => radius(z, { ...truth, m2: 0.9995 })) })
    expect(fit.m2).toBeCloseTo(0.9995, 6)
    expect(fit.warnings.map((w) => w.code)).not.toContain('m2_below_one')
  })

  it('when the input cannot be fitted then it throws clear errors', () => {
    expect(engineErrorOf(() => fitBeamCaustic({ wavelengthNm: lambdaNm, zMm: [0, 1, 2], radiusMm: [1, 1, 1] })).code).toBe('too_few_measurements')
    expect(engineErrorOf(() => fitBeamCaustic({ wavelengthNm: lambdaNm, zMm: [0, 1, 2, 3], radiusMm: [1, 1, 1] })).code).toBe('invalid_measurements')
    expect(engineErrorOf(() => fitBeamCaustic({ wavelengthNm: lambdaNm, zMm: [0, 1, 2, 3], radiusMm: [1, -1, 1, 1] })).code).toBe('invalid_measurements')
    // Radii shrinking along a straight line in w²: no minimum anywhere.
    const line = [0, 100, 200, 300, 400]
    expect(engineErrorOf(() => fitBeamCaustic({ wavelengthNm: lambdaNm, zMm: line, radiusMm: line.map((z) => Math.sqrt(1 - z / 1000)) })).code).toBe('no_waist_in_fit')
    expect(engineErrorOf(() => fitBeamCaustic({ wavelengthNm: 1.064, zMm: positions, radiusMm: positions.map((z) => radius(z)) })).message).toMatch(/wavelengthNm/)
  })
})

describe('createInputBeam', () => {
  it('when a waist is entered then y defaults to x and M² to 1', () => {
    const { beam, fits } = createInputBeam({ kind: 'waist', wavelengthNm: 780, x: { waistRadiusMm: 0.4, waistPositionMm: -50 } })
    expect(beam.y).toEqual({ waistRadiusMm: 0.4, waistPositionMm: -50, m2: 1 })
    expect(fits).toBeNull()
  })

  it('when x and y radii are measured then each axis gets its own fit', () => {
    const yTruth = { w0: 0.3, z0: 80, m2: 1.1 }
    const result = createInputBeam({
      kind: 'measured',
      wavelengthNm: lambdaNm,
      zMm: positions,
      radiusXMm: positions.map((z) => radius(z)),
      radiusYMm: positions.map((z) => radius(z, yTruth)),
    })
    expect(result.beam.x.m2).toBeCloseTo(1.3, 9)
    expect(result.beam.y.waistRadiusMm).toBeCloseTo(0.3, 9)
    expect(result.beam.y.waistPositionMm).toBeCloseTo(80, 6)
    expect(result.fits?.y.m2).toBeCloseTo(1.1, 9)
  })

  it('when the waist is nonsense then the message names the field', () => {
    const error = engineErrorOf(() => createInputBeam({ kind: 'waist', wavelengthNm: 1064, x: { waistRadiusMm: -1, waistPositionMm: 0 } }))
    expect(error.code).toBe('invalid_beam')
    expect(error.message).toMatch(/waistRadiusMm/)
  })
})

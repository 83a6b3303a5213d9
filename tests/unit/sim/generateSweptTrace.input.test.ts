import { describe, expect, it } from 'vitest'
import { generateSweptTrace, simPresets, type SweptTraceOptions } from '../../../shared/sim'
import { errorOf } from './helpers'

const valid: SweptTraceOptions = { gouyOneWayRad: 0.9, finesse: 300, orderPowers: [1, 0.1], sampleCount: 5000, fsrCount: 2 }

describe('generateSweptTrace input checks', () => {
  it('when an option is out of range then an EngineError names it, the range and the value', () => {
    expect(errorOf({ ...valid, finesse: 0 })).toEqual({
      code: 'invalid_sim_options',
      message: 'finesse must be a number above 1 and at most 1e7, got 0',
    })
    expect(errorOf({ ...valid, sampleCount: 10.5 }).message).toBe('sampleCount must be an integer from 16 to 20,000,000, got 10.5')
    expect(errorOf({ ...valid, gouyOneWayRad: Math.PI }).message).toMatch(/^gouyOneWayRad must be a number strictly between 0 and π/)
    expect(errorOf({ ...valid, orderPowers: [0, 0] }).message).toBe('orderPowers must have at least one order with power above 0')
    expect(errorOf({ ...valid, orderPowers: [1, -0.1] }).message).toBe('orderPowers must hold finite numbers ≥ 0, got [1, -0.1]')
    expect(errorOf({ ...valid, nonlinearity: 1 }).message).toBe('nonlinearity must be a number from -0.9 to 0.9, got 1')
    expect(errorOf({ ...valid, quantizationBits: 7.5 }).message).toBe('quantizationBits must be an integer, got 7.5')
    expect(errorOf({ ...valid, direction: 'sideways' as 'up' }).message).toBe("direction must be 'up' or 'down', got sideways")
  })

  it('when the cavity geometry is unstable then the cavity model refuses it', () => {
    // g1 = g2 = 1 − 300/100 = −2: g1·g2 = 4 > 1 (OPTICS-CHECKS 2(a), unstable row; Kogelnik & Li (1966)).
    const error = errorOf({ ...valid, cavity: { wavelengthNm: 1064, lengthMm: 300, roc1Mm: 100, roc2Mm: 100 } })
    expect(error.code).toBe('unstable_cavity')
  })

  it('when a cavity is given then ψ and the FSR come from its geometry, not from gouyOneWayRad', () => {
    // Symmetric L = 100 mm, R = 250 mm: ψ = arccos(0.6) = 0.927295218 rad, FSR = 1 498 962 290 Hz
    // (OPTICS-CHECKS 2(a); Kogelnik & Li, Appl. Opt. 5, 1550 (1966); FSR = c/2L, Siegman (1986) ch. 11).
    const { truth } = generateSweptTrace({
      ...valid,
      gouyOneWayRad: 0.1,
      cavity: { wavelengthNm: 1064, lengthMm: 100, roc1Mm: 250, roc2Mm: 250 },
    })
    expect(truth.gouyOneWayRad).toBeCloseTo(0.927295218, 9)
    expect(truth.fsrHz).toBeCloseTo(1498962290, 0)
  })

  it('when there is no cavity and no fsrHz then the truth has no FSR in Hz', () => {
    expect(generateSweptTrace(valid).truth.fsrHz).toBeNull()
    expect(generateSweptTrace({ ...valid, fsrHz: 3e8 }).truth.fsrHz).toBe(3e8)
  })
})

describe('simPresets', () => {
  it('when each preset is generated then its truth matches its options and its geometry', () => {
    expect(Object.keys(simPresets).length).toBeGreaterThanOrEqual(3)
    for (const [name, options] of Object.entries(simPresets)) {
      const trace = generateSweptTrace(options)
      const total = options.orderPowers.reduce((s, p) => s + p, 0)
      expect(trace.truth.fundamentalFraction, name).toBeCloseTo(options.orderPowers[0] / total, 12)
      // FSR = c / 2L (Siegman, "Lasers" (1986), ch. 11).
      expect(trace.truth.fsrHz, name).toBeCloseTo(299_792_458 / (2 * options.cavity!.lengthMm * 1e-3), 0)
      expect(trace.transmissionV.length, name).toBe(options.sampleCount)
      expect(trace.truth.peaks.filter((p) => p.order === 0).length, name).toBeGreaterThanOrEqual(2)
      expect(trace.truth.samplesPerLinewidth, name).toBeGreaterThan(5)
    }
  })

  it('when the reference preset is read then its Gouy phase is that of a flat + 500 mm mirror 100 mm apart', () => {
    // g1 = 1, g2 = 0.8: ψ = arccos(√0.8) = 0.463647609 rad (OPTICS-CHECKS 2(a), plano-concave row).
    expect(simPresets['reference-1064'].gouyOneWayRad).toBeCloseTo(0.463647609, 9)
  })
})

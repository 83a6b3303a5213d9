import { describe, expect, it } from 'vitest'
import { fittedCurve } from '../../../src/components/trace/fittedCurve'
import { canCalibrate, timeToFsr } from '../../../src/components/trace/sweepAxis'

describe('fittedCurve', () => {
  it('when evaluated at a resonance centre and at ± half the FWHM then it gives the height and half the height above the dark level', () => {
    // Lorentzian definition: value 1/2 at ±FWHM/2 (Siegman, "Lasers" (1986), §11.3).
    const peak = { t: 1e-3, height: 2, fwhmSeconds: 4e-6 }
    const [centre, left, right, far] = fittedCurve([1e-3, 1e-3 - 2e-6, 1e-3 + 2e-6, 1], [peak], 0.01)
    expect(centre).toBeCloseTo(2.01, 12)
    expect(left).toBeCloseTo(1.01, 12)
    expect(right).toBeCloseTo(1.01, 12)
    expect(far).toBeCloseTo(0.01, 9)
  })

  it('when two resonances overlap then their contributions add', () => {
    const peaks = [
      { t: 0, height: 1, fwhmSeconds: 2 },
      { t: 2, height: 1, fwhmSeconds: 2 },
    ]
    // At t = 1 each contributes 1 / (1 + 1) = 0.5.
    expect(fittedCurve([1], peaks, 0)[0]).toBeCloseTo(1, 12)
  })

  it('when a peak has no usable width then it is left out rather than drawn as a spike', () => {
    expect([...fittedCurve([0], [{ t: 0, height: 5, fwhmSeconds: 0 }], 0.2)]).toEqual([0.2])
  })
})

describe('timeToFsr', () => {
  it('when times sit on and between TEM00 resonances then they map to whole and fractional FSR', () => {
    // TEM00s one FSR apart define the frequency axis (Siegman, "Lasers" (1986), §11.3); spacing changes
    // from 1 ms to 1.2 ms here, as with a nonlinear piezo.
    const marks = [0.001, 0.002, 0.0032]
    const out = timeToFsr([0.001, 0.0015, 0.002, 0.0026, 0.0032, 0.0044, 0], marks)
    const expected = [0, 0.5, 1, 1.5, 2, 3, -1]
    expected.forEach((value, i) => expect(out[i]).toBeCloseTo(value, 10))
  })

  it('when fewer than two TEM00s are known then calibration is refused with a reason', () => {
    expect(canCalibrate([0.1])).toBe(false)
    expect(canCalibrate([0.1, Number.NaN, 0.2])).toBe(true)
    expect(() => timeToFsr([0], [0.1])).toThrow('at least two TEM00 resonances are needed to calibrate the sweep (got 1)')
  })
})

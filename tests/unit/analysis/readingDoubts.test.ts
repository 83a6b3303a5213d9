import { describe, expect, it } from 'vitest'
import { readingDoubts } from '../../../shared/analysis/readingDoubts'
import { gouyPhaseOneWay, type CavityGeometry } from '../../../shared/cavity'
import type { SpectrumReading } from '../../../shared/orders/readSpectrum'

const cavity: CavityGeometry = { wavelengthNm: 1064, lengthMm: 150, roc1Mm: 250, roc2Mm: 250 }
/** One-way Gouy phase of a two-mirror cavity, g = 1 − L/R (Kogelnik & Li, Appl. Opt. 5, 1550 (1966)). */
const gouyOf = (c: CavityGeometry) => gouyPhaseOneWay(1 - c.lengthMm / c.roc1Mm!, 1 - c.lengthMm / c.roc2Mm!)
const predicted = gouyOf(cavity)

/** A reading with only what readingDoubts looks at: which peaks are TEM00, its cost, fraction, period and ψ. */
function reading(fundamentals: number[], cost: number, roughFraction: number, gouyRad = predicted): SpectrumReading {
  return {
    calibration: { coefficients: [0, 1], t0Seconds: 0, scaleSeconds: 1, polynomialOrder: 1, residualRmsFsr: 0, fsrSeconds: 1e-3, meanSpacingSeconds: 1e-3, spacingRangeSeconds: [1e-3, 1e-3] },
    direction: 'up', gouyRad, fundamentals, fsrIndex: fundamentals.map((_, k) => k), orders: [], cost, roughFraction, periodSeconds: 1e-3, calibratingLinks: 2, satelliteOffsetFsr: null,
  }
}

/** Inputs of a sound reading: right geometry, everything counted, nothing unexplained. */
function sound(overrides: Partial<Parameters<typeof readingDoubts>[0]> = {}): Parameters<typeof readingDoubts>[0] {
  return {
    readings: [reading([0, 5], 0.02, 0.6), reading([2, 7], 0.9, 0.3)],
    fundamentalFraction: 0.6,
    cavity,
    predictedGouyRad: predicted,
    measuredGouyRad: predicted,
    transverseCount: 4,
    directionGiven: false,
    unassignedHeightShare: 0,
    lineModelFailed: false,
    lineModelChiSquare: 1.1,
    unsteady: null,
    calibrated: true,
    wholePeriodCounted: true,
    fundamentalCount: 2,
    lineModelFraction: null,
    ...overrides,
  }
}
const ambiguity = (input: Parameters<typeof readingDoubts>[0]) => readingDoubts(input).warnings.find((w) => w.code === 'ambiguous_reading')?.message

describe('readingDoubts', () => {
  it('when the reading is sound then no doubt is raised', () => {
    expect(readingDoubts(sound()).warnings).toEqual([])
  })

  it('when less than one whole FSR could be counted then the fraction is said to count only the resonances seen', () => {
    expect(ambiguity(sound({ wholePeriodCounted: false }))).toMatch(/less than one whole FSR/)
  })

  it('when the line model and the resonances found disagree on the fraction by more than 3 points then both are named', () => {
    expect(ambiguity(sound({ fundamentalFraction: 0.966, lineModelFraction: 0.924, lineModelChiSquare: 52 }))).toMatch(/96\.6 %.*92\.4 %/)
    // Within 3 points the two measures agree as well as a result may be off unflagged.
    expect(ambiguity(sound({ fundamentalFraction: 0.93, lineModelFraction: 0.91, lineModelChiSquare: 52 }))).toBeUndefined()
  })

  it('when the calibrated sweep spans 2.5 FSRs but only two TEM00 were found then the period is put in doubt', () => {
    // TEM00 sits at whole numbers of the calibrated axis: −0.2 … 2.3 FSR crosses 0, 1 and 2.
    expect(ambiguity(sound({ sweepRangeFsr: [-0.2, 2.3] }))).toMatch(/should cross TEM00 3 times, but only 2 TEM00 resonances were found/)
    expect(ambiguity(sound({ sweepRangeFsr: [-0.2, 2.3], fundamentalCount: 3 }))).toBeUndefined()
  })

  it('when the third TEM00 would sit within 0.03 FSR of the end of the sweep (maybe cut off) then it is not expected', () => {
    expect(ambiguity(sound({ sweepRangeFsr: [-0.2, 2.02] }))).toBeUndefined()
  })

  it('when families change height unlike TEM00 then the reading is in doubt and the ratios are named', () => {
    const familiesDisagree = { fundamentalRatio: 1, orders: [{ order: 1, ratio: 0.7 }, { order: 2, ratio: 0.61 }], compared: 3 }
    expect(ambiguity(sound({ familiesDisagree }))).toMatch(/No reading.*TEM00 changes height ×1\.00 but order 1 ×0\.70, order 2 ×0\.61/)
  })

  it('when order 1 merges with TEM00 then the measure of power is in doubt, naming the order', () => {
    expect(ambiguity(sound({ mergedLowOrder: { order: 1, linewidths: 1.3 } }))).toMatch(/power cannot be measured reliably: order 1 stands 1\.3 linewidths from TEM00/)
  })

  describe('when the Gouy phase disagrees with the geometry (length entered 10 % long)', () => {
    const off = { measuredGouyRad: gouyOf({ ...cavity, lengthMm: 135 }) }

    it('with two TEM00 and a reading with another TEM00 family not far behind (0.2) then the reading is in doubt', () => {
      const message = ambiguity(sound({ ...off, readings: [reading([0, 5], 0.1, 0.6), reading([2, 7], 0.3, 0.3)] }))
      expect(message).toMatch(/two TEM00 in view.*another family of resonances may be TEM00/)
    })

    it('with two TEM00 but every other TEM00 family far behind (0.8) then only the geometry is questioned', () => {
      const warnings = readingDoubts(sound({ ...off })).warnings.map((w) => w.code)
      expect(warnings).toEqual(['geometry_mismatch'])
    })

    it('with two TEM00 and a period resting on one family repeating once then the reading is in doubt, rival or not', () => {
      const oneLink = { ...reading([0, 5], 0.1, 0.6), calibratingLinks: 1 }
      expect(ambiguity(sound({ ...off, readings: [oneLink, reading([2, 7], 0.9, 0.3)] }))).toMatch(/another family of resonances may be TEM00/)
      const twoLinks = { ...oneLink, calibratingLinks: 2 }
      expect(ambiguity(sound({ ...off, readings: [twoLinks, reading([2, 7], 0.9, 0.3)] }))).toBeUndefined()
    })

    it('with three TEM00 in view then the TEM00 spacing checks the reading and only the geometry is questioned', () => {
      const warnings = readingDoubts(sound({ ...off, fundamentalCount: 3, readings: [reading([0, 5, 9], 0.1, 0.6), reading([2, 7], 0.3, 0.3)] })).warnings.map((w) => w.code)
      expect(warnings).toEqual(['geometry_mismatch'])
    })
  })
})

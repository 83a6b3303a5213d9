import { describe, expect, it } from 'vitest'
import { countingWindow } from '../../../shared/orders/countingWindow'
import { evaluateSessionCase } from '../accuracy/evaluateSessionCase'
import { sessionCase } from '../accuracy/sessionCases'

describe('the stretch over which orders are counted', () => {
  it('when two TEM00 stand at FSR indices 0 and 2 of a 2.4-FSR sweep then the window runs over their two periods', () => {
    expect(countingWindow([0, 2], [-0.2, 2.2], [0.3])).toEqual({ first: 0, last: 2 })
  })

  it('when the TEM00 indices claim more FSRs than the calibrated sweep spans then nothing is counted', () => {
    // A calibration gone non-monotonic once put two TEM00 9,201 FSRs apart inside a sweep of a few FSRs.
    expect(countingWindow([-9201, 0], [-3, 3], [0.3])).toBeNull()
  })

  it('when the TEM00 indices claim more FSRs than the record can resolve (10 samples each) then nothing is counted', () => {
    expect(countingWindow([0, 400], [0, 20000], [0.3], 3560)).toBeNull()
    expect(countingWindow([0, 300], [0, 300.5], [0.3], 3560)).toEqual({ first: 0, last: 300 })
  })

  it('when a generated trace once led the reading to a non-monotonic calibration then the analysis ends, flagged', () => {
    // Session case 57 of seed base 90000 (a ringing detector, finesse 15): the line model was asked to measure 9,201
    // periods and the process grew past 19 GB. It now reads TEM00 against the resonances seen and says so.
    const outcome = evaluateSessionCase(57, sessionCase(57, 90000))
    expect(outcome.foundFraction).not.toBeNull()
    expect(outcome.warnings).toContain('ambiguous_reading')
  }, 60_000)
})

/** How far a stored result can be trusted (shared/api/resultTrust.ts): the rules are ours, the results invented. */
import { describe, expect, it } from 'vitest'
import { clampShare, judgeResultTrust, trustInputOf, unassignedPower } from '../../../shared/api/resultTrust'

const warnings = (...codes: string[]) => codes.map((code) => ({ code, message: `${code} said` }))

describe('judgeResultTrust', () => {
  it('when a result carries only harmless warnings and shares within 0–100 % then it is trusted', () => {
    const trust = judgeResultTrust(trustInputOf({ fundamentalFraction: 0.86, warnings: warnings('undersampled'), orders: { '0': 0.86, '1': 0.1, '2': 0.04 } }))
    expect(trust).toEqual({ doubtful: false, reasons: [], summary: null })
  })
  it('when an ambiguous reading, a geometry that disagrees or many unassigned peaks are reported then each is a reason in one line', () => {
    const trust = judgeResultTrust(trustInputOf({ fundamentalFraction: 0.9, warnings: warnings('many_unassigned', 'geometry_mismatch', 'ambiguous_reading') }))
    expect(trust.doubtful).toBe(true)
    expect(trust.reasons).toHaveLength(3)
    expect(trust.summary).toMatch(/^In doubt: another reading .*; the transverse orders .*; many resonances belong to no order\.$/)
    expect(trust.summary).not.toContain('\n')
  })
  it('when a share lies outside 0–100 % by more than rounding then the result is in doubt and the raw value is named', () => {
    const trust = judgeResultTrust(trustInputOf({ fundamentalFraction: 1, warnings: [], orders: { '0': 1.014, '1': -0.006 } }))
    expect(trust.doubtful).toBe(true)
    expect(trust.summary).toContain('101.4 %')
    expect(judgeResultTrust({ fundamentalFraction: 1.0004, warningCodes: [] }).doubtful).toBe(false)
  })
})

describe('clampShare and unassignedPower', () => {
  it('when a share is outside 0–1 then it is clamped for display and the raw value kept', () => {
    expect(clampShare(1.014)).toEqual({ shown: 1, raw: 1.014, clamped: true })
    expect(clampShare(-0.009)).toEqual({ shown: 0, raw: -0.009, clamped: true })
    expect(clampShare(0.4)).toEqual({ shown: 0.4, raw: 0.4, clamped: false })
  })
  it('when a quarter of the resonance area is unassigned then that quarter is named and TEM00 is given against all the area', () => {
    const peaks = [
      { kind: 'carrier', area: 6 },
      { kind: 'carrier', area: 3 },
      { kind: 'unassigned', area: 2 },
      { kind: 'unassigned', area: 1 },
    ]
    const power = unassignedPower({ fundamentalFraction: 0.9, peaks })
    expect(power.unassignedShare).toBeCloseTo(0.25, 12)
    expect(power.unassignedCount).toBe(2)
    expect(power.fundamentalOfAll).toBeCloseTo((0.9 * 9) / 12, 12)
  })
})

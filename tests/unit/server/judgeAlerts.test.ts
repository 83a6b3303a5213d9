/** Alerts judge only trustworthy results (issue 13): a result in doubt neither raises nor clears any rule. Invented figures. */
import { describe, expect, it } from 'vitest'
import { judgeAlerts } from '../../../server/alerts/judgeAlerts'

describe('judgeAlerts', () => {
  const settings = { targetFundamentalFraction: 0.9, finesseDropPercent: 30 }
  it('when a trusted result is low on both counts then both rules are breached', () => {
    const verdicts = judgeAlerts({ fundamentalFraction: 0.5, finesse: 100, settings, medianFinesse: 400 })
    expect(verdicts.fraction_below_target).toMatchObject({ breached: true })
    expect(verdicts.finesse_drop).toMatchObject({ breached: true, threshold: 280 })
  })
  it('when the same figures come from a result in doubt then neither rule is judged', () => {
    expect(judgeAlerts({ fundamentalFraction: 0.5, finesse: 100, settings, medianFinesse: 400, readingInDoubt: true })).toEqual({ fraction_below_target: 'unknown', finesse_drop: 'unknown' })
  })
})

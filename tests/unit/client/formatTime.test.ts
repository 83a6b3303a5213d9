/** Times everywhere in the app: ISO 8601 dates and a 24-hour clock (ISO 8601:2019), in the browser's zone. */
import { describe, expect, it } from 'vitest'
import { formatClock, formatDate, formatDateTime, formatRecent } from '../../../src/components/time/formatTime'
import { formatShareError } from '../../../src/components/analysis/formatQuantity'

describe('formatTime', () => {
  const afternoon = new Date(2026, 11, 3, 14, 5, 9) // local time
  it('when a time is in the afternoon then it reads on a 24-hour clock with an ISO date, never AM/PM', () => {
    expect(formatDate(afternoon)).toBe('2026-12-03')
    expect(formatClock(afternoon)).toBe('14:05')
    expect(formatDateTime(afternoon, { seconds: true })).toBe('2026-12-03 14:05:09')
    expect(formatDateTime(null)).toBe('—')
  })
  it('when a scan is from today then only the clock shows, and from another day the date too', () => {
    const now = new Date(2026, 11, 3, 18, 0, 0)
    expect(formatRecent(afternoon, now)).toBe('14:05')
    expect(formatRecent(new Date(2026, 10, 23, 9, 30), now)).toBe('2026-11-23 09:30')
  })
})

describe('formatShareError', () => {
  it('when an error is below a tenth of a point then it keeps two significant digits instead of "0.0"', () => {
    expect(formatShareError(0.00012)).toBe('0.012')
    expect(formatShareError(0.0034)).toBe('0.34')
    expect(formatShareError(0.014)).toBe('1.4')
  })
})

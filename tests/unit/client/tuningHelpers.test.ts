import { describe, expect, it } from 'vitest'
import { computeCavityModel } from '../../../shared/cavity'
import { orderTicks } from '../../../src/components/cavity/orderTicks'
import { barScaleFor, finishedEntries, fractionChange, sessionEntries, type SessionEntry } from '../../../src/components/tuning/tuningSession'

function entry(id: string, minute: number, fraction: number | null = 0.8, status: SessionEntry['status'] = 'done'): SessionEntry {
  return { analysisId: id, createdAt: new Date(Date.UTC(2026, 11, 1, 10, minute)).toISOString(), status, fundamentalFraction: fraction }
}

describe('sessionEntries', () => {
  it('when uploads come 5–10 minutes apart after a 45-minute pause then the session starts after the pause, oldest first', () => {
    const rows = [entry('f', 100), entry('e', 95), entry('d', 85), entry('c', 40), entry('b', 10), entry('a', 5)] // newest first, as the history answers
    expect(sessionEntries(rows).map((row) => row.analysisId)).toEqual(['d', 'e', 'f'])
    // A pause of exactly 30 minutes still belongs to the session; the gap is configurable.
    expect(sessionEntries([entry('b', 40), entry('a', 10)]).map((row) => row.analysisId)).toEqual(['a', 'b'])
    expect(sessionEntries(rows, { gapMinutes: 7 }).map((row) => row.analysisId)).toEqual(['e', 'f'])
  })

  it('when the scans lie ten days apart then they are not one session', () => {
    const tenDaysAgo = { ...entry('old', 0), createdAt: new Date(Date.UTC(2026, 10, 21, 10, 0)).toISOString() }
    expect(sessionEntries([entry('new', 0), tenDaysAgo]).map((row) => row.analysisId)).toEqual(['new'])
  })

  it('when an event updates an analysis already listed then it appears once, in its latest state', () => {
    const rows = [entry('a', 31, null, 'queued'), entry('a', 31, 0.9, 'done')]
    const session = sessionEntries(rows)
    expect(session).toHaveLength(1)
    expect(session[0].status).toBe('done')
  })

  it('when some analyses failed or are running then the trend keeps only finished ones', () => {
    const rows = [entry('a', 1), entry('b', 2, null, 'failed'), entry('c', 3, null, 'running')]
    expect(finishedEntries(rows).map((row) => row.analysisId)).toEqual(['a'])
    expect(finishedEntries([{ ...entry('x', 4), excluded: { reason: 'wrong cavity' } }])).toEqual([])
  })
})

describe('fractionChange', () => {
  it('when TEM00 goes from 81.0 % to 84.5 % then the change is +3.5 points up', () => {
    const change = fractionChange(0.845, 0.81)
    expect(change?.direction).toBe('up')
    expect(change?.points).toBeCloseTo(3.5, 10)
    expect(fractionChange(0.8, 0.83)?.direction).toBe('down')
    expect(fractionChange(0.8, 0.8002)?.direction).toBe('same')
    expect(fractionChange(0.8, null)).toBeNull()
  })
  it('when the change is within twice the combined stated errors then it reads as the same, not as progress', () => {
    // Errors of 0.8 and 0.6 points combine to 1.0; 1.9 points is within 2σ, 2.1 points is not.
    expect(fractionChange(0.829, 0.81, { latest: 0.008, previous: 0.006 })?.direction).toBe('same')
    expect(fractionChange(0.831, 0.81, { latest: 0.008, previous: 0.006 })?.direction).toBe('up')
    expect(fractionChange(0.789, 0.81, { latest: 0.008, previous: 0.006 })?.direction).toBe('down')
  })
})

describe('barScaleFor', () => {
  it('when shares of 4 %, then 14 %, then 6 % arrive then the full bar goes 10 %, 25 % and stays at 25 %', () => {
    const first = barScaleFor(0.04)
    const second = barScaleFor(0.14, first)
    expect([first, second, barScaleFor(0.06, second)]).toEqual([0.1, 0.25, 0.25])
    expect(barScaleFor(1.3)).toBe(1)
  })
})

describe('orderTicks', () => {
  it('when the cavity is confocal then order 2 sits on TEM00 and orders 1, 3, 5 at half an FSR, all flagged degenerate', () => {
    // Confocal (L = R): ψ = π/2, order N at N/2 FSR mod 1 (Siegman, "Lasers" (1986), ch. 19).
    const model = computeCavityModel({ wavelengthNm: 1064, lengthMm: 100, roc1Mm: 100, roc2Mm: 100 })
    const ticks = orderTicks(model.gouyOneWayRad, model.degenerateOrders)
    const byOrder = new Map(ticks.map((tick) => [tick.order, tick]))
    expect(byOrder.get(2)?.offsetFsr).toBeCloseTo(0, 9)
    expect(byOrder.get(1)?.offsetFsr).toBeCloseTo(0.5, 9)
    expect(byOrder.get(2)?.degenerateWith).toContain(4)
    expect(byOrder.get(1)?.degenerateWith).toEqual([3, 5])
    // Orders 1, 3, 5 share a position, so their labels take three different rows.
    expect(new Set([1, 3, 5].map((order) => byOrder.get(order)?.labelRow)).size).toBe(3)
  })

  it('when the cavity is plano-concave (L = 100 mm, R = 500 mm) then order 1 sits at ψ/π ≈ 0.148 FSR', () => {
    // ψ = arccos(√(g1 g2)) with g1 = 1, g2 = 0.8 (Kogelnik & Li, Appl. Opt. 5, 1550 (1966)): ψ/π = 0.14758.
    const model = computeCavityModel({ wavelengthNm: 1064, lengthMm: 100, roc1Mm: null, roc2Mm: 500 })
    const ticks = orderTicks(model.gouyOneWayRad, model.degenerateOrders)
    expect(ticks[0].offsetFsr).toBeCloseTo(Math.acos(Math.sqrt(0.8)) / Math.PI, 9)
    expect(ticks[0].offsetFsr).toBeCloseTo(0.14758, 4)
    expect(ticks.every((tick) => tick.degenerateWith.length === 0)).toBe(true)
  })
})

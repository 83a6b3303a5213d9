/**
 * Pure helpers of the history page: date-range presets, trend points, maintenance-log marker placement
 * and picking two analyses. Dates are invented; the rules are our own (common practice for chart UIs).
 */
import { describe, expect, it } from 'vitest'
import type { HistoryRow } from '../../../../shared/api/tuningTypes'
import { customRange, parsePreset, presetRange, rangeQuery } from '../../../../src/components/history/historyRange'
import { comparePath, togglePick } from '../../../../src/components/history/pickPair'
import { markerAt, placeMarkers, trendSeries, type MarkerEntry } from '../../../../src/components/history/trendSeries'

const DAY_MS = 86_400_000

function row(id: string, iso: string, fraction: number | null, status: HistoryRow['status'] = 'done', excluded: HistoryRow['excluded'] = null): HistoryRow {
  return {
    analysisId: id, traceId: `t-${id}`, createdAt: iso, fileName: `${id}.csv`, note: '', status, fundamentalFraction: fraction, fundamentalFractionError: fraction === null ? null : 0.002,
    finesse: fraction === null ? null : 400 * fraction, linewidthHz: fraction === null ? null : 1.9e6, doubt: null, excluded, error: null,
  }
}

function entry(id: string, iso: string, kindLabel: string): MarkerEntry {
  return { id, occurredAt: iso, kindLabel, text: `text of ${id}` }
}

describe('presetRange and customRange', () => {
  const now = new Date(Date.UTC(2026, 11, 1, 12, 0, 0))

  it('when the 7, 30 and 90 day presets are asked at noon then each ends now and starts that many days earlier', () => {
    for (const days of [7, 30, 90]) {
      const range = presetRange(days, now)
      expect(range.to.getTime()).toBe(now.getTime())
      expect(now.getTime() - range.from.getTime()).toBe(days * DAY_MS)
    }
    expect(rangeQuery(presetRange(7, now))).toEqual({ from: '2026-11-24T12:00:00.000Z', to: '2026-12-01T12:00:00.000Z' })
  })

  it('when a preset length is not positive then it is refused with the value named', () => {
    expect(() => presetRange(0, now)).toThrow('days must be a positive number (got 0)')
  })

  it('when two calendar days are picked (in either order) then the range covers both whole days in local time', () => {
    const range = customRange(new Date(2026, 10, 20, 15, 30), new Date(2026, 10, 10, 9, 0))
    expect(range.from).toEqual(new Date(2026, 10, 10, 0, 0, 0, 0))
    expect(range.to).toEqual(new Date(2026, 10, 20, 23, 59, 59, 999))
  })

  it('when the address holds an unknown range key then the 30-day preset is used', () => {
    expect(parsePreset('90d')).toBe('90d')
    expect(parsePreset('custom')).toBe('custom')
    expect(parsePreset('1y')).toBe('30d')
    expect(parsePreset(undefined, '7d')).toBe('7d')
  })
})

describe('trendSeries', () => {
  it('when rows come newest first with a failed and a running analysis then only done ones remain, oldest first, in display units', () => {
    const rows = [row('c', '2026-11-03T00:00:00Z', 0.9), row('x', '2026-11-02T12:00:00Z', null, 'failed'), row('b', '2026-11-02T00:00:00Z', 0.8), row('r', '2026-11-02T06:00:00Z', null, 'running'), row('a', '2026-11-01T00:00:00Z', 0.7)]
    const fraction = trendSeries(rows, 'fundamentalFraction')
    expect(fraction.analysisIds).toEqual(['a', 'b', 'c'])
    expect(fraction.x).toEqual([Date.UTC(2026, 10, 1) / 1000, Date.UTC(2026, 10, 2) / 1000, Date.UTC(2026, 10, 3) / 1000])
    expect(fraction.y[0]).toBeCloseTo(70, 10)
    expect(trendSeries(rows, 'linewidthHz').y[2]).toBeCloseTo(1.9, 10) // MHz
    expect(trendSeries(rows, 'finesse').y[1]).toBeCloseTo(320, 10)
  })
  it('when an analysis is excluded with a reason then it is no point of any trend', () => {
    const rows = [row('b', '2026-11-02T00:00:00Z', 0.2, 'done', { reason: 'a 780 nm trace dropped here by mistake' }), row('a', '2026-11-01T00:00:00Z', 0.7)]
    expect(trendSeries(rows, 'fundamentalFraction').analysisIds).toEqual(['a'])
    expect(trendSeries(rows, 'finesse').analysisIds).toEqual(['a'])
  })
})

describe('placeMarkers and markerAt', () => {
  // 1 px per hour from 2026-11-01T00:00Z, so positions are easy to read.
  const origin = Date.UTC(2026, 10, 1) / 1000
  const toPx = (x: number) => (x - origin) / 3600

  it('when entries fall outside the visible range then they get no marker', () => {
    const markers = placeMarkers([entry('early', '2026-10-30T00:00:00Z', 'Cleaning'), entry('in', '2026-11-02T00:00:00Z', 'Inspection'), entry('late', '2026-11-20T00:00:00Z', 'Other')], origin, origin + 10 * 86_400, toPx)
    expect(markers.map((m) => m.entryId)).toEqual(['in'])
    expect(markers[0].px).toBe(24)
    expect(markers[0].row).toBe(0)
  })

  it('when two labels would overlap then the second moves to the next row, and a far one returns to the first row', () => {
    // "Cleaning" is 8 characters × 6.5 px = 52 px wide; the next entry is 10 px later, the third 200 px later.
    const markers = placeMarkers([entry('a', '2026-11-01T10:00:00Z', 'Cleaning'), entry('b', '2026-11-01T20:00:00Z', 'Realignment'), entry('c', '2026-11-09T14:00:00Z', 'Inspection')], origin, origin + 30 * 86_400, toPx)
    expect(markers.map((m) => m.row)).toEqual([0, 1, 0])
  })

  it('when more labels collide than there are rows then the extras share the last row', () => {
    const crowded = ['a', 'b', 'c', 'd'].map((id, i) => entry(id, new Date(Date.UTC(2026, 10, 1, i)).toISOString(), 'Mirror change'))
    expect(placeMarkers(crowded, origin, origin + 86_400, toPx, { maxRows: 3 }).map((m) => m.row)).toEqual([0, 1, 2, 2])
  })

  it('when the pointer is within 5 px of a marker then that marker is found, the nearest of two', () => {
    const markers = placeMarkers([entry('a', '2026-11-01T10:00:00Z', 'Cleaning'), entry('b', '2026-11-01T16:00:00Z', 'Other')], origin, origin + 86_400, toPx)
    expect(markerAt(markers, 12)?.entryId).toBe('a')
    expect(markerAt(markers, 14)?.entryId).toBe('b')
    expect(markerAt(markers, 30)).toBeNull()
  })
})

describe('togglePick and comparePath', () => {
  it('when a third analysis is picked then the oldest pick is dropped; picking one again unpicks it', () => {
    expect(togglePick([], 'a')).toEqual(['a'])
    expect(togglePick(['a', 'b'], 'c')).toEqual(['b', 'c'])
    expect(togglePick(['a', 'b'], 'a')).toEqual(['b'])
  })

  it('when two are picked then the comparison opens with the older analysis as A', () => {
    const times: Record<string, string> = { new: '2026-11-20T00:00:00Z', old: '2026-11-01T00:00:00Z' }
    expect(comparePath(['new', 'old'], (id) => times[id])).toBe('/compare?a=old&b=new')
    expect(comparePath(['new'], (id) => times[id])).toBeNull()
  })
})

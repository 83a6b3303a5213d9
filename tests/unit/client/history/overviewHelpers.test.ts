/** Pure helpers of the overview: the sparkline path, aligning several cavities' points, and the series palette. */
import { describe, expect, it } from 'vitest'
import { alignSeries } from '../../../../src/components/overview/alignSeries'
import { seriesColour, seriesDash } from '../../../../src/components/overview/seriesPalette'
import { sparklinePath } from '../../../../src/components/overview/sparklinePath'

const at = (day: number) => new Date(Date.UTC(2026, 10, day)).toISOString()

describe('sparklinePath', () => {
  it('when three points span 0.7–0.9 over two days then they fill the box corner to corner with y pointing up', () => {
    // width 104, height 24, pad 2: inner box 100 × 20 starting at (2, 2).
    const line = sparklinePath(
      [
        { t: at(3), fundamentalFraction: 0.9 },
        { t: at(1), fundamentalFraction: 0.7 },
        { t: at(2), fundamentalFraction: 0.8 },
      ],
      null,
      { width: 104, height: 24, padPx: 2 },
    )
    expect(line.path).toBe('M2 22 L52 12 L102 2')
    expect(line.last).toEqual({ x: 102, y: 2 })
  })

  it('when the target lies inside the drawn range then its height is given, and outside it is null', () => {
    const points = [
      { t: at(1), fundamentalFraction: 0.7 },
      { t: at(2), fundamentalFraction: 0.9 },
    ]
    expect(sparklinePath(points, 0.8, { width: 104, height: 24, padPx: 2 }).targetY).toBe(12)
    expect(sparklinePath(points, 0.95, { width: 104, height: 24, padPx: 2 }).targetY).toBeNull()
  })

  it('when every point is the same then the line is drawn flat through the middle rather than blown up', () => {
    const line = sparklinePath(
      [
        { t: at(1), fundamentalFraction: 0.85 },
        { t: at(2), fundamentalFraction: 0.85 },
      ],
      null,
      { width: 104, height: 24, padPx: 2 },
    )
    expect(line.path).toBe('M2 12 L102 12')
  })

  it('when one point or none is given then a single dot in the middle, or nothing, is drawn', () => {
    expect(sparklinePath([{ t: at(1), fundamentalFraction: 0.5 }], null, { width: 104, height: 24, padPx: 2 }).last).toEqual({ x: 52, y: 12 })
    expect(sparklinePath([])).toEqual({ path: '', last: null, targetY: null })
  })
})

describe('alignSeries', () => {
  it('when two cavities were measured at different times then both sit on the union of times with gaps as null', () => {
    expect(
      alignSeries([
        { x: [1, 3], y: [10, 30] },
        { x: [2, 3, 4], y: [20, 31, 40] },
      ]),
    ).toEqual([
      [1, 2, 3, 4],
      [10, null, 30, null],
      [null, 20, 31, 40],
    ])
  })

  it('when a series has more x than y values then it is refused, naming the series', () => {
    expect(() => alignSeries([{ x: [1, 2], y: [1] }])).toThrow('series 0 has 2 x values but 1 y values')
  })
})

describe('seriesColour', () => {
  it('when more than eight cavities are drawn then colours repeat but the first eight are all different (Okabe & Ito, 2008)', () => {
    const first = Array.from({ length: 8 }, (_, i) => seriesColour(i))
    expect(new Set(first).size).toBe(8)
    expect(seriesColour(8)).toBe(seriesColour(0))
    expect(seriesDash(0)).toBeUndefined()
    expect(seriesDash(1)).toEqual([8, 4])
  })
})

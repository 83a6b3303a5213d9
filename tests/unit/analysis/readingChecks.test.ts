import { describe, expect, it } from 'vitest'
import { familiesDisagree, lowOrderMergedWithTem00 } from '../../../shared/analysis/readingChecks'
import type { AnalysisPeak } from '../../../shared/analysis/types'

/** A labelled carrier peak of the given order and height (V) at time t (ms), 2 µs wide. */
function peak(order: number, height: number, tMs: number, fwhmMicroseconds = 2): AnalysisPeak {
  return { t: tMs * 1e-3, order, kind: 'carrier', height, heightError: null, fwhmSeconds: fwhmMicroseconds * 1e-6, area: height * fwhmMicroseconds * 1e-6, share: 0, positionFsr: null, fitted: true }
}

describe('families that change height from one FSR period to the next unlike TEM00', () => {
  const sigmaV = 0.005

  it('when TEM00 keeps its height while orders 1, 2 and 3 all fall by a third then the reading is named with each ratio', () => {
    // The shape of a misread period seen on a generated 1.17-FSR trace: TEM00 and order 1 of equal height taken for
    // one family, so every "family" pairs order N with order N + 1 (1.48/1.48, 0.43/0.30, 0.28/0.17, 0.15/0.10 V).
    const found = familiesDisagree([peak(0, 1.48, 0), peak(1, 0.43, 4), peak(2, 0.28, 6), peak(3, 0.15, 8), peak(0, 1.478, 10.7), peak(1, 0.30, 14.7), peak(2, 0.17, 16.7), peak(3, 0.1, 18.7)], sigmaV)
    expect(found).not.toBeNull()
    expect(found!.orders.map((o) => o.order)).toEqual([1, 2, 3])
    expect(found!.fundamentalRatio).toBeCloseTo(1.478 / 1.48, 6)
    expect(found!.orders[0].ratio).toBeCloseTo(0.3 / 0.43, 6)
  })

  it('when every family falls by the same 20 % (the laser power drifting) then nothing is named', () => {
    expect(familiesDisagree([peak(0, 1.5, 0), peak(1, 0.5, 3), peak(2, 0.3, 5), peak(0, 1.2, 10), peak(1, 0.4, 13), peak(2, 0.24, 15)], sigmaV)).toBeNull()
  })

  it('when one family of six disagrees (one line mislabelled near a degeneracy) then nothing is named', () => {
    const peaks = [1, 2, 3, 4, 5, 6].flatMap((order) => [peak(order, 0.4, order), peak(order, order === 2 ? 0.28 : 0.4, 10 + order)])
    expect(familiesDisagree([peak(0, 1.9, 0), peak(0, 1.9, 10), ...peaks], sigmaV)).toBeNull()
  })

  it('when the heights differ by less than 5σ of their ratio then nothing is named, however unlike', () => {
    // 0.06 → 0.045 V with σ = 5 mV: the ratio 0.75 is uncertain by about 0.1.
    expect(familiesDisagree([peak(0, 1, 0), peak(1, 0.06, 3), peak(2, 0.06, 5), peak(0, 1, 10), peak(1, 0.045, 13), peak(2, 0.045, 15)], sigmaV)).toBeNull()
  })

  it('when a line was crossed at another sweep speed (twice as wide) then it is not compared', () => {
    expect(familiesDisagree([peak(0, 1, 0), peak(1, 0.5, 3), peak(2, 0.4, 5), peak(0, 1, 10), peak(1, 0.3, 13, 4), peak(2, 0.2, 15, 4)], sigmaV)).toBeNull()
  })
})

describe('a strong low order merged with TEM00', () => {
  // Order N sits N·ψ/π FSR from TEM00, folded into one FSR (Siegman, "Lasers" (1986), ch. 19).
  it('when order 1 sits 0.013 FSR from TEM00 at a linewidth of 0.01 FSR then it is named, 1.3 linewidths away', () => {
    // ψ/π = 0.987: order 1 at 0.987, i.e. 0.013 FSR below the next TEM00.
    const found = lowOrderMergedWithTem00(0.987 * Math.PI, 0.01)
    expect(found?.order).toBe(1)
    expect(found?.linewidths).toBeCloseTo(1.3, 6)
  })

  it('when order 2 sits 0.015 FSR from TEM00 (ψ/π = 0.4925) then order 2 is named', () => {
    expect(lowOrderMergedWithTem00(0.4925 * Math.PI, 0.01)?.order).toBe(2)
  })

  it('when orders 1 and 2 stand 3 linewidths or more clear of TEM00 then nothing is named', () => {
    expect(lowOrderMergedWithTem00(0.3 * Math.PI, 0.01)).toBeNull()
    expect(lowOrderMergedWithTem00(0.49 * Math.PI, 0.01)).toBeNull()
  })
})

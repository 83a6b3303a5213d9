import { describe, expect, it } from 'vitest'
import { unsteadyOrder } from '../../../shared/analysis/readingDoubts'
import type { AnalysisPeak } from '../../../shared/analysis/types'

/** A labelled carrier peak of the given order, height (V) and width (µs). */
function peak(order: number | null, height: number, fwhmMicroseconds = 2, t = 0): AnalysisPeak {
  return { t, order, kind: order === null ? 'unassigned' : 'carrier', height, heightError: null, fwhmSeconds: fwhmMicroseconds * 1e-6, area: height * fwhmMicroseconds * 1e-6, share: 0, positionFsr: null, fitted: true }
}

describe('resonances of one order that differ in height', () => {
  const sigmaV = 0.002

  it('when three resonances read as order 2 fall 0.45 → 0.24 → 0.14 V one period apart then the order is named with its 3.3-fold spread', () => {
    // The shape of a misread ladder (orders 2, 3, 4 taken for one order repeating): seen on a generated quiet 8-bit trace.
    const found = unsteadyOrder([peak(0, 1.6), peak(2, 0.45), peak(2, 0.24), peak(2, 0.14), peak(0, 1.55)], sigmaV)
    expect(found).not.toBeNull()
    expect(found!.order).toBe(2)
    expect(found!.ratio).toBeCloseTo(0.45 / 0.14, 6)
  })

  it('when the resonances of every order agree within the drift of the laser power (10 %) then nothing is named', () => {
    expect(unsteadyOrder([peak(0, 1.6), peak(1, 0.4), peak(0, 1.5), peak(1, 0.37), peak(2, 0.1), peak(2, 0.092)], sigmaV)).toBeNull()
  })

  it('when the lower resonance is cut by the end of the record (another width) then it is not compared', () => {
    expect(unsteadyOrder([peak(0, 1.3, 2), peak(0, 1.31, 2), peak(0, 0.019, 5)], sigmaV)).toBeNull()
  })

  it('when both resonances are within the noise of each other then nothing is named, however large their ratio', () => {
    // 0.008 V and 0.002 V: fourfold, but 3σ apart, not 5σ.
    expect(unsteadyOrder([peak(3, 0.008), peak(3, 0.002)], sigmaV)).toBeNull()
  })

  it('when a line of an order is missing at its place (read as zero) then the ratio is unbounded and the order is named', () => {
    expect(unsteadyOrder([peak(1, 0.5), peak(1, -0.001)], sigmaV)?.ratio).toBe(Infinity)
  })
})

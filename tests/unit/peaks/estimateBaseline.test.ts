import { describe, expect, it } from 'vitest'
import { estimateBaseline } from '../../../shared/peaks/estimateBaseline'

describe('estimateBaseline on a quantised record', () => {
  it('when a quiet baseline sits on one code then the dark level is that code, not a Gaussian band correction above it', () => {
    // Without noise to dither it, where the level lies inside its code cannot be known; the code is the best reading
    // (Widrow & Kollár, "Quantization Noise" (2008), ch. 2). σ = q/√12 is the quantisation noise (Bennett 1948).
    const q = 0.004
    const y = new Float64Array(10_000).fill(5 * q)
    for (let i = 500; i < y.length; i += 1000) y[i] = 100 * q
    const { darkLevelV } = estimateBaseline(y, q / Math.sqrt(12), { quantumV: q })
    expect(darkLevelV).toBeCloseTo(5 * q, 12)
  })

  it('when a quarter of the baseline samples fall one code higher then the level moves up about a quarter step', () => {
    // Grouped-data median: c − q/2 + q·(n/2 − below)/inside, inside the code c holding the median (common practice).
    const q = 0.004
    const y = Float64Array.from({ length: 8000 }, (_, i) => (i % 4 === 0 ? 6 * q : 5 * q))
    const { darkLevelV } = estimateBaseline(y, q / Math.sqrt(12), { quantumV: q, followDrift: false })
    // 2000 of 8000 in the code above: the median class is code 5, 6000 inside it, none below → 5q − q/2 + q·4000/6000.
    expect(darkLevelV).toBeCloseTo(5 * q - q / 2 + (q * 4000) / 6000, 6)
  })
})

import { describe, expect, it } from 'vitest'
import { decimateMinMax, indexRange, sampleAt } from '../../../src/components/trace/decimateMinMax'

/** A noisy sweep with a few one-sample spikes, the case min/max decimation exists for. */
function spikyTrace(n: number) {
  const x = new Float64Array(n)
  const y = new Float64Array(n)
  let seed = 12345
  const random = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648)
  for (let i = 0; i < n; i++) {
    x[i] = i * 1e-6
    y[i] = 0.01 * (random() - 0.5)
  }
  const spikes = [1234, 333_333, 777_777, n - 3]
  for (const [k, i] of spikes.entries()) y[i] = 1 + k
  y[500_000] = -2
  return { x, y, spikes }
}

describe('decimateMinMax', () => {
  it('when 1,000,000 points go into 1,200 buckets then at most 2,400 points come out, in time order', () => {
    const { x, y } = spikyTrace(1_000_000)
    const out = decimateMinMax(x, y, 1200)
    expect(out.x.length).toBeLessThanOrEqual(2400)
    expect(out.x.length).toBeGreaterThan(2300) // noise makes min ≠ max in (almost) every bucket
    for (let k = 1; k < out.indices.length; k++) expect(out.indices[k]).toBeGreaterThan(out.indices[k - 1])
  })

  it('when a bucket is decimated then its min and max are kept exactly (every bucket checked)', () => {
    const { x, y } = spikyTrace(1_000_000)
    const buckets = 1000
    const out = decimateMinMax(x, y, buckets)
    const kept = new Set(out.indices)
    for (let b = 0; b < buckets; b++) {
      let min = Infinity
      let max = -Infinity
      for (let i = b * 1000; i < (b + 1) * 1000; i++) {
        min = Math.min(min, y[i])
        max = Math.max(max, y[i])
      }
      const keptValues = [...kept].filter((i) => i >= b * 1000 && i < (b + 1) * 1000).map((i) => y[i])
      expect(Math.min(...keptValues)).toBe(min)
      expect(Math.max(...keptValues)).toBe(max)
    }
  })

  it('when one-sample spikes are present then every spike survives with its exact time and value', () => {
    const { x, y, spikes } = spikyTrace(1_000_000)
    const out = decimateMinMax(x, y, 640)
    for (const i of [...spikes, 500_000]) {
      const k = out.indices.indexOf(i)
      expect(k).toBeGreaterThanOrEqual(0)
      expect(out.x[k]).toBe(x[i])
      expect(out.y[k]).toBe(y[i])
    }
  })

  it('when the range is short then every finite sample is kept and NaN gaps are dropped', () => {
    const x = [0, 1, 2, 3, 4]
    const y = [1, Number.NaN, 3, 4, 5]
    const out = decimateMinMax(x, y, 10)
    expect([...out.x]).toEqual([0, 2, 3, 4])
    expect([...out.indices]).toEqual([0, 2, 3, 4])
  })

  it('when a window is given then only samples inside it are used', () => {
    const { x, y } = spikyTrace(1_000_000)
    const window = indexRange(x, 0.3, 0.4)
    const out = decimateMinMax(x, y, 500, window)
    expect(out.indices[0]).toBeGreaterThanOrEqual(window.from)
    expect(out.indices[out.indices.length - 1]).toBeLessThan(window.to)
    expect(out.indices).toContain(333_333) // the spike inside the window
  })

  it('when another channel is sampled at the kept indices then it lines up with them', () => {
    const ramp = Float64Array.from({ length: 10 }, (_, i) => i * 10)
    expect([...sampleAt(ramp, [1, 4, 9])]).toEqual([10, 40, 90])
  })

  it('when the input is inconsistent then it says which argument is wrong', () => {
    expect(() => decimateMinMax([1, 2], [1], 4)).toThrow('x and y must have the same length (got 2 and 1)')
    expect(() => decimateMinMax([1], [1], 0)).toThrow('buckets must be a positive integer (got 0)')
    expect(() => decimateMinMax([1], [1], 2, { from: 0, to: 5 })).toThrow('0 <= from <= to <= 1')
  })
})

describe('indexRange', () => {
  it('when a window falls between samples then the range includes one neighbour on each side', () => {
    const x = [0, 1, 2, 3, 4, 5]
    expect(indexRange(x, 1.5, 3.5)).toEqual({ from: 1, to: 5 })
    expect(indexRange(x, -10, 10)).toEqual({ from: 0, to: 6 })
  })
})

import { describe, expect, it } from 'vitest'
import { readTrace } from '../../../shared/trace/readTrace'

const bytes = (text: string) => new TextEncoder().encode(text)

describe('readTrace: units written after an underscore', () => {
  it('when the header reads time_s, ramp_V, transmission_mV then time is the axis and millivolts become volts', () => {
    const rows = Array.from({ length: 40 }, (_, i) => `${(i * 1e-5).toPrecision(6)},${(i / 40).toFixed(4)},${i === 20 ? 500 : 2}`)
    const trace = readTrace(bytes(['time_s,ramp_V,transmission_mV', ...rows].join('\n')))
    expect(trace.sampleCount).toBe(40)
    expect(trace.sampleInterval).toBeCloseTo(1e-5, 12)
    expect(trace.channels.map((c) => [c.name, c.unit])).toEqual([
      ['ramp', 'V'],
      ['transmission', 'V'],
    ])
    expect(trace.channels[1].values[20]).toBeCloseTo(0.5, 12)
  })

  it('when a name merely contains an underscore then it stays the channel name', () => {
    const rows = Array.from({ length: 20 }, (_, i) => `${i * 1e-3},${i % 5}`)
    const trace = readTrace(bytes(['time,pd_trans', ...rows].join('\n')))
    expect(trace.channels[0].name).toBe('pd_trans')
  })
})

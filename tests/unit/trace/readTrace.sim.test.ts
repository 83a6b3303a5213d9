import { describe, expect, it } from 'vitest'
import { generateSweptTrace, simPresets } from '../../../shared/sim'
import { formatTraceCsv, type TraceCsvLayout } from '../../../shared/trace/formatTraceCsv'
import { readTrace } from '../../../shared/trace/readTrace'

// The project's physically based generator (noise, quantisation, flyback, triangle ramps, sidebands, drift) gives
// realistic traces of an invented lab; the reader must keep their samples and tell the ramp from the transmission.
const layouts: TraceCsvLayout[] = ['plain-columns', 'side-by-side-blocks', 'index-with-interval', 'preamble-header']

describe('readTrace on the project generator presets', () => {
  Object.entries(simPresets).forEach(([name, preset], k) => {
    const layout = layouts[k % layouts.length]
    it(`when preset ${name} is written as ${layout} then samples and roles come back`, () => {
      const sim = generateSweptTrace({ ...preset, sampleCount: Math.min(preset.sampleCount, 20_000) })
      const text = formatTraceCsv(
        {
          sampleInterval: sim.sampleIntervalSeconds,
          time: sim.tSeconds,
          channels: [
            { name: 'Piezo monitor', values: sim.rampV! },
            { name: 'Photodiode', values: sim.transmissionV },
          ],
        },
        { layout, delimiter: k % 2 ? ';' : ',', decimalComma: k % 2 === 1, valueUnit: k % 2 ? 'mV' : 'V' },
      )
      const trace = readTrace(new TextEncoder().encode(text))
      expect(trace.sampleCount).toBe(sim.tSeconds.length)
      expect(trace.sampleInterval / sim.sampleIntervalSeconds).toBeCloseTo(1, 9)
      expect(trace.startTime).toBeCloseTo(sim.tSeconds[0], 12)
      expect(trace.channels.map((c) => c.role)).toEqual(['ramp', 'transmission'])
      let worst = 0
      for (let i = 0; i < trace.sampleCount; i++) {
        worst = Math.max(worst, Math.abs(trace.channels[1].values[i] - sim.transmissionV[i]))
      }
      expect(worst).toBeLessThan(1e-9)
      expect(trace.warnings).toEqual([])
    })
  })
})

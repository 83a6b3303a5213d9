import { readFileSync } from 'node:fs'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'
import { readTrace } from '../../../shared/trace/readTrace'

// Real recordings copied byte for byte into fixtures/real (provenance and GPL-3.0 note: fixtures/real/SOURCES.md).
const here = dirname(fileURLToPath(import.meta.url))
const fixture = (name: string): Uint8Array => readFileSync(join(here, '../../../fixtures/real', name))

// Expected values come from the files themselves (the per-channel "Record Length" and "Sample Interval" rows)
// and from the provenance note's description of the layout; the glitched rows were located by reading the files.
const cases = [
  {
    file: 'planoconcave_633nm_L150mm_R300mm_ramp_2ch.csv',
    interval: 1.0e-5,
    firstTime: -12.8799994e-3,
    // The note says "sample 1189"; that is the 1-based line number. 0-based, the broken row ("-0.0E-3",
    // between -1.0099997E-3 and -989.999622107E-6) is sample 1188.
    glitch: 1188,
    expectedAtGlitch: -1.0e-3,
  },
  {
    file: 'planoconcave_633nm_L295mm_R300mm_stability_edge_2ch.csv',
    interval: 4.0e-5,
    firstTime: -55.119998753e-3,
    // Printed "0.0E-3" between 959.999859333E-6 and 1.0399998E-3.
    glitch: 1403,
    expectedAtGlitch: 1.0e-3,
  },
]

describe('readTrace on the real side-by-side exports', () => {
  for (const c of cases) {
    describe(c.file, () => {
      const trace = readTrace(fixture(c.file))

      it('when read then each channel holds 2500 samples on one axis with the stated interval', () => {
        expect(trace.sampleCount).toBe(2500)
        expect(trace.time).toHaveLength(2500)
        for (const channel of trace.channels) expect(channel.values).toHaveLength(2500)
        expect(trace.sampleInterval / c.interval).toBeCloseTo(1, 6)
        expect(trace.startTime).toBeCloseTo(c.firstTime, 9)
      })

      it('when read then channel 1 is the ramp and channel 2 the transmission, in volts', () => {
        expect(trace.channels.map((channel) => channel.name)).toEqual(['CH1', 'CH2'])
        expect(trace.channels.map((channel) => channel.role)).toEqual(['ramp', 'transmission'])
        expect(trace.channels.map((channel) => channel.unit)).toEqual(['V', 'V'])
      })

      it('when read then the one glitched time is repaired and named in a warning', () => {
        expect(trace.warnings.map((warning) => warning.code)).toEqual(['time_axis_repaired'])
        expect(trace.warnings[0].message).toContain(`sample ${c.glitch} `)
        expect(trace.time[c.glitch]).toBeCloseTo(c.expectedAtGlitch, 7)
        // The axis is uniform afterwards: every step equals the interval.
        for (let i = 1; i < trace.sampleCount; i++) {
          expect(Math.abs(trace.time[i] - trace.time[i - 1] - trace.sampleInterval)).toBeLessThan(1e-12)
        }
      })

      it('when read then the per-channel metadata is kept and the voltages are those printed', () => {
        expect(trace.metadata['Record Length']).toBe('2500 Points')
        expect(trace.metadata['Vertical Units']).toBe('Volts')
        expect(trace.metadata['CH1 Source']).toBe('CH1')
        expect(trace.metadata['CH2 Vertical Scale']).toBe('2.0000000')
        // 8-bit data: every voltage is a multiple of vertical scale / 25 (the note's "Layout of the files").
        const step = 2.0 / 25
        for (const value of trace.channels[1].values) expect(Math.abs(value / step - Math.round(value / step))).toBeLessThan(1e-5)
      })
    })
  }
})

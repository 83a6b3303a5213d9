import { describe, expect, it } from 'vitest'
import { formatTraceCsv, type FormatTraceCsvOptions, type TraceCsvLayout } from '../../../shared/trace/formatTraceCsv'
import { readTrace } from '../../../shared/trace/readTrace'
import type { Trace } from '../../../shared/trace/types'
import { makeSweptTrace, type SweptTrace } from './makeSweptTrace'

// Values are written with 12 significant digits, so they must come back within a few parts in 1e12
// (relative to the largest value, 1.5 V here). Print precision is the only loss allowed.
const PRINT_TOLERANCE = 1e-10

const utf8 = (text: string): Uint8Array => new TextEncoder().encode(text)
const latin1 = (text: string): Uint8Array => Uint8Array.from(text, (char) => char.charCodeAt(0))

function expectSameSamples(trace: Trace, source: SweptTrace): void {
  expect(trace.sampleCount).toBe(source.channels[0].values.length)
  expect(trace.channels).toHaveLength(source.channels.length)
  source.channels.forEach((channel, k) => {
    const read = trace.channels[k].values
    let worst = 0
    for (let i = 0; i < read.length; i++) worst = Math.max(worst, Math.abs(read[i] - channel.values[i]))
    expect(worst).toBeLessThan(PRINT_TOLERANCE)
  })
  expect(trace.sampleInterval).toBeCloseTo(source.sampleInterval, 15)
  expect(trace.startTime).toBeCloseTo(source.startTime, 12)
  expect(trace.time[trace.sampleCount - 1]).toBeCloseTo(
    source.startTime + (trace.sampleCount - 1) * source.sampleInterval,
    12,
  )
}

function expectRoles(trace: Trace, roles: string[]): void {
  expect(trace.channels.map((channel) => channel.role)).toEqual(roles)
  for (const channel of trace.channels) expect(channel.roleEvidence).toMatch(/\w+.*\./)
}

const layoutsWithTime: TraceCsvLayout[] = ['plain-columns', 'preamble-header', 'side-by-side-blocks', 'index-with-interval']
const formats: { label: string; options: FormatTraceCsvOptions }[] = [
  { label: 'comma, LF', options: { delimiter: ',', lineEnding: '\n' } },
  { label: 'semicolon, decimal comma, CRLF', options: { delimiter: ';', decimalComma: true, lineEnding: '\r\n' } },
  { label: 'tab, decimal comma, LF', options: { delimiter: '\t', decimalComma: true } },
  { label: 'tab, CR only', options: { delimiter: '\t', lineEnding: '\r' } },
  { label: 'comma, time in ms, exponents', options: { timeUnit: 'ms', numberStyle: 'exponent', significantDigits: 14 } },
  {
    label: 'semicolon, engineering exponents, decimal comma',
    options: { delimiter: ';', decimalComma: true, numberStyle: 'engineering', significantDigits: 14 },
  },
]

describe('readTrace round trip through formatTraceCsv', () => {
  const source = makeSweptTrace()
  const input = { ...source, metadata: { Lab: 'Invented optics lab, bench 3', Operator: 'A. Example' } }

  for (const layout of layoutsWithTime) {
    for (const { label, options } of formats) {
      it(`when a trace is written as ${layout} (${label}) then the same samples, axis and roles come back`, () => {
        const text = formatTraceCsv(input, { ...options, layout })
        const trace = readTrace(utf8(text))
        expectSameSamples(trace, source)
        expectRoles(trace, ['ramp', 'transmission', 'reflection'])
        expect(trace.channels.map((channel) => channel.name)).toEqual(['ramp', 'transmission', 'reflection'])
        expect(trace.channels.every((channel) => channel.unit === 'V')).toBe(true)
        expect(trace.warnings).toEqual([])
      })
    }
  }

  it('when the export holds one channel beside its time column then it reads back', () => {
    const one = makeSweptTrace({ channels: ['transmission'] })
    const trace = readTrace(utf8(formatTraceCsv(one, { layout: 'plain-columns', numberStyle: 'engineering' })))
    expectSameSamples(trace, one)
    expectRoles(trace, ['transmission'])
  })

  it('when the preamble carries metadata then the key/value pairs are kept', () => {
    const trace = readTrace(utf8(formatTraceCsv(input, { layout: 'preamble-header' })))
    expect(trace.metadata.Lab).toBe('Invented optics lab, bench 3')
    expect(trace.metadata.Operator).toBe('A. Example')
  })

  it('when side-by-side blocks repeat their metadata then shared keys appear once and per-channel keys are prefixed', () => {
    const trace = readTrace(utf8(formatTraceCsv(input, { layout: 'side-by-side-blocks' })))
    expect(trace.metadata['Record Length']).toBe('2000 Points')
    expect(trace.metadata['transmission Source']).toBe('transmission')
    expect(trace.metadata.Lab).toBe('Invented optics lab, bench 3')
  })

  it('when there is no header row then channels are named CH1… and the first column is the time axis', () => {
    const trace = readTrace(utf8(formatTraceCsv(source, { layout: 'headerless-columns' })))
    expectSameSamples(trace, source)
    expect(trace.channels.map((channel) => channel.name)).toEqual(['CH1', 'CH2', 'CH3'])
    expectRoles(trace, ['ramp', 'transmission', 'reflection'])
  })

  it('when one channel is written as a single column then the interval option gives the time axis', () => {
    const one = makeSweptTrace({ channels: ['transmission'], startTime: 0 })
    const trace = readTrace(utf8(formatTraceCsv(one, { layout: 'single-column' })), { sampleIntervalSeconds: 2e-6 })
    expectSameSamples(trace, one)
    expectRoles(trace, ['transmission'])
  })

  it('when a single column uses decimal commas then the values are still read', () => {
    const one = makeSweptTrace({ channels: ['reflection'], startTime: 0 })
    const text = formatTraceCsv(one, { layout: 'single-column', decimalComma: true, delimiter: ';' })
    expect(text).toContain(',')
    const trace = readTrace(utf8(text), { sampleIntervalSeconds: 2e-6 })
    expectSameSamples(trace, one)
  })

  it('when values are printed in mV and time in µs (Latin-1 0xB5) then they are converted to V and s', () => {
    const text = formatTraceCsv(source, { layout: 'plain-columns', valueUnit: 'mV', timeUnit: 'µs', delimiter: ';' })
    const bytes = latin1(text)
    expect(Array.from(bytes)).toContain(0xb5)
    const trace = readTrace(bytes)
    expectSameSamples(trace, source)
    expect(trace.channels.map((channel) => channel.unit)).toEqual(['V', 'V', 'V'])
    expect(trace.warnings.map((warning) => warning.code)).toEqual(['latin1_decoded'])
  })

  it('when the header says "us" and "ms" in UTF-8 side-by-side blocks then units are converted', () => {
    const text = formatTraceCsv(source, { layout: 'side-by-side-blocks', valueUnit: 'mV', timeUnit: 'us' })
    const trace = readTrace(utf8(text))
    expectSameSamples(trace, source)
  })

  it('when the index layout states the interval in ms then the time axis is in seconds', () => {
    const text = formatTraceCsv(source, { layout: 'index-with-interval', timeUnit: 'ms' })
    expect(text).toContain('Sample interval,0.002,ms')
    const trace = readTrace(utf8(text))
    expectSameSamples(trace, source)
  })
})

describe('readTrace on damaged samples', () => {
  const source = makeSweptTrace()

  it('when one printed time is glitched then the axis is rebuilt and the warning names the sample', () => {
    const lines = formatTraceCsv(source, { layout: 'plain-columns' }).split('\n')
    const glitched = 777
    const cells = lines[glitched + 1].split(',')
    cells[0] = '0.0E-3'
    lines[glitched + 1] = cells.join(',')
    const trace = readTrace(utf8(lines.join('\n')))
    expectSameSamples(trace, source)
    const warning = trace.warnings.find((w) => w.code === 'time_axis_repaired')
    expect(warning?.message).toContain(`sample ${glitched} `)
  })

  it('when samples are blank, NaN or clipped then they read as NaN with warnings', () => {
    const lines = formatTraceCsv(source, { layout: 'plain-columns' }).split('\n')
    const edit = (row: number, column: number, value: string): void => {
      const cells = lines[row + 1].split(',')
      cells[column] = value
      lines[row + 1] = cells.join(',')
    }
    edit(10, 2, '')
    edit(11, 2, 'NaN')
    edit(12, 2, '9.9E37')
    edit(13, 3, '-inf')
    const trace = readTrace(utf8(lines.join('\n')))
    const transmission = trace.channels[1].values
    expect(Number.isNaN(transmission[10])).toBe(true)
    expect(Number.isNaN(transmission[11])).toBe(true)
    expect(Number.isNaN(transmission[12])).toBe(true)
    expect(Number.isNaN(trace.channels[2].values[13])).toBe(true)
    expect(transmission[14]).toBeCloseTo(source.channels[1].values[14], 10)
    const codes = trace.warnings.map((w) => w.code)
    expect(codes).toContain('missing_samples')
    expect(codes).toContain('clipped_samples')
    expect(trace.sampleCount).toBe(2000)
  })

  it('when cells are quoted then the quote-aware reader gives the same samples', () => {
    const text = formatTraceCsv(source, { layout: 'plain-columns' })
      .split('\n')
      .map((line, row) => (row > 0 && line !== '' ? line.split(',').map((cell) => `"${cell}"`).join(',') : line))
      .join('\n')
    const trace = readTrace(utf8(text))
    expectSameSamples(trace, source)
  })

  it('when a header row is repeated inside the data then it is skipped with a warning', () => {
    const lines = formatTraceCsv(source, { layout: 'plain-columns' }).split('\n')
    lines.splice(1001, 0, lines[0])
    const trace = readTrace(utf8(lines.join('\n')))
    expectSameSamples(trace, source)
    expect(trace.warnings.map((w) => w.code)).toContain('skipped_rows')
  })
})

describe('readTrace role overrides', () => {
  const text = formatTraceCsv(makeSweptTrace(), { layout: 'plain-columns' })

  it('when roles are given by name and by index then they replace detection', () => {
    const trace = readTrace(utf8(text), { roles: { ramp: 'unknown', '2': 'transmission' } })
    expect(trace.channels.map((c) => c.role)).toEqual(['unknown', 'transmission', 'transmission'])
    expect(trace.channels[0].roleEvidence).toBe('set by the user')
    expect(trace.channels[2].roleEvidence).toBe('set by the user')
    expect(trace.channels[1].roleEvidence).not.toBe('set by the user')
  })

  it('when a role names a channel that does not exist then the error lists the channels', () => {
    expect(() => readTrace(utf8(text), { roles: { CH9: 'ramp' } })).toThrow(/channels are 0 "ramp"/)
  })
})

describe('readTrace text encodings', () => {
  const source = makeSweptTrace()
  const text = formatTraceCsv(source, { layout: 'preamble-header', timeUnit: 'µs' })

  it('when the file starts with a UTF-8 byte-order mark then it reads the same', () => {
    const bytes = utf8(text)
    const withMark = new Uint8Array(bytes.length + 3)
    withMark.set([0xef, 0xbb, 0xbf])
    withMark.set(bytes, 3)
    expectSameSamples(readTrace(withMark), source)
    expect(readTrace(withMark).metadata).toHaveProperty('Sample interval')
  })

  it('when the file is UTF-16 with a byte-order mark then it is re-encoded and reads the same', () => {
    const units = new Uint16Array(text.length + 1)
    units[0] = 0xfeff
    for (let i = 0; i < text.length; i++) units[i + 1] = text.charCodeAt(i)
    expectSameSamples(readTrace(new Uint8Array(units.buffer)), source)
  })
})

describe('readTrace header forms', () => {
  const rows = Array.from({ length: 40 }, (_, i) => [i * 0.5, Math.sin(i / 4), i % 10 === 0 ? 3 : 0.1])

  it('when names and units sit on two header rows then both are used', () => {
    const text = ['Time,Ramp,Cavity', 'ms,mV,V', ...rows.map((r) => r.join(','))].join('\n')
    const trace = readTrace(utf8(text))
    expect(trace.sampleInterval).toBeCloseTo(0.5e-3, 12)
    expect(trace.channels.map((c) => [c.name, c.unit])).toEqual([['Ramp', 'V'], ['Cavity', 'V']])
    expect(trace.channels[0].values[2]).toBeCloseTo(Math.sin(0.5) / 1000, 12)
  })

  it('when the time header is only a unit ("s" or "[ms]") then it is still the time axis', () => {
    for (const [header, scale] of [['s', 1], ['[ms]', 1e-3]] as const) {
      const text = [`${header};CH1 [V];CH2 [V]`, ...rows.map((r) => r.join(';'))].join('\n')
      const trace = readTrace(utf8(text))
      expect(trace.channels).toHaveLength(2)
      expect(trace.sampleInterval).toBeCloseTo(0.5 * scale, 12)
    }
  })

  it('when the first column counts samples and a header line gives the rate then time comes from the rate', () => {
    const text = ['# Sampling rate: 2 kS/s', '# Start time = -5 ms', 'Sample,CH1', ...rows.map((r, i) => `${i + 1},${r[1]}`)].join('\n')
    const trace = readTrace(utf8(text))
    expect(trace.sampleInterval).toBeCloseTo(5e-4, 15)
    expect(trace.startTime).toBeCloseTo(-5e-3, 15)
    expect(trace.channels.map((c) => c.name)).toEqual(['CH1'])
  })
})

describe('readTrace without a time column', () => {
  const source = makeSweptTrace({ startTime: 2e-4 })
  const [ramp, transmission] = source.channels

  it('when only channels are printed and the preamble states interval and start then the axis comes from them', () => {
    const body = Array.from(ramp.values, (r, i) => `${r};${transmission.values[i]}`)
    const text = ['Instrument;invented recorder', 'Sample interval;2 us', 'Start time;0,2 ms', '', 'CH1 (V);CH2 (V)', ...body].join('\r\n')
    const trace = readTrace(utf8(text))
    expect(trace.sampleInterval).toBeCloseTo(2e-6, 15)
    expect(trace.startTime).toBeCloseTo(2e-4, 15)
    expect(trace.channels.map((c) => c.role)).toEqual(['ramp', 'transmission'])
    expect(trace.channels[1].values[1234]).toBe(transmission.values[1234])
  })

  it('when a headerless index column is followed by channels then the index is not taken for a channel', () => {
    const body = Array.from(ramp.values, (r, i) => `${i},${r},${transmission.values[i]}`)
    const text = ['dt,2e-6', ...body].join('\n')
    const trace = readTrace(utf8(text))
    expect(trace.channels).toHaveLength(2)
    expect(trace.sampleInterval).toBe(2e-6)
    expect(trace.startTime).toBe(0)
  })
})

describe('readTrace side-by-side blocks on different time axes', () => {
  it('when the second block prints shifted times then a warning says the first block\'s axis was used', () => {
    const source = makeSweptTrace({ channels: ['ramp', 'transmission'] })
    const lines = formatTraceCsv(source, { layout: 'side-by-side-blocks' }).trimEnd().split('\n')
    const shifted = lines.map((line) => {
      const cells = line.split(',')
      cells[9] = String(Number(cells[9]) + 5e-6)
      return cells.join(',')
    })
    const trace = readTrace(utf8(shifted.join('\n')))
    expect(trace.warnings.map((w) => w.code)).toEqual(['block_times_differ'])
    expect(trace.warnings[0].message).toContain("transmission's block")
    expect(trace.startTime).toBeCloseTo(source.startTime, 12)
  })
})

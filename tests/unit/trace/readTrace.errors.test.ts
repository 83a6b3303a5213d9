import { describe, expect, it } from 'vitest'
import { EngineError } from '../../../shared/errors'
import { formatTraceCsv } from '../../../shared/trace/formatTraceCsv'
import { readTrace } from '../../../shared/trace/readTrace'
import type { ReadTraceOptions } from '../../../shared/trace/types'
import { makeSweptTrace } from './makeSweptTrace'

const utf8 = (text: string): Uint8Array => new TextEncoder().encode(text)

function engineErrorOf(bytes: Uint8Array, options?: ReadTraceOptions): EngineError {
  try {
    readTrace(bytes, options)
  } catch (error) {
    expect(error).toBeInstanceOf(EngineError)
    return error as EngineError
  }
  throw new Error('expected readTrace to throw')
}

const good = formatTraceCsv(makeSweptTrace({ sampleCount: 200, sweeps: 1 }), { layout: 'plain-columns' })

describe('readTrace errors name the problem', () => {
  it('when the only channel printed NaN throughout then no_signal names its column, not a missing time axis (issue 17)', () => {
    const rows = Array.from({ length: 200 }, (_, i) => `${(i * 1e-5).toFixed(5)},NaN`)
    const error = engineErrorOf(utf8(['time,ch1', ...rows].join('\n')))
    expect(error.code).toBe('no_signal')
    expect(error.message).toMatch(/^Column 2 of the file holds only NaN/)
    const allNan = Array.from({ length: 200 }, () => 'NaN,NaN')
    expect(engineErrorOf(utf8(['t,ch1', ...allNan].join('\n'))).message).toMatch(/^Columns 1, 2 of the file hold only NaN/)
  })

  it('when the sample interval is 1e9 s then implausible_interval warns; at 1 µs it does not', () => {
    const column = Array.from({ length: 200 }, (_, i) => Math.sin(i / 10).toFixed(4)).join('\n')
    const slow = readTrace(utf8(column), { sampleIntervalSeconds: 1e9 })
    expect(slow.warnings.find((warning) => warning.code === 'implausible_interval')?.message).toMatch(/^The sample interval is 1.00e\+9 s/)
    const usual = readTrace(utf8(column), { sampleIntervalSeconds: 1e-6 })
    expect(usual.warnings.map((warning) => warning.code)).not.toContain('implausible_interval')
  })

  it('when one of two channels printed NaN throughout then the other is still read', () => {
    const rows = Array.from({ length: 200 }, (_, i) => `${(i * 1e-5).toFixed(5)},${Math.sin(i / 10).toFixed(4)},NaN`)
    const trace = readTrace(utf8(['time,ch1,ch2', ...rows].join('\n')))
    expect(trace.channels.map((channel) => channel.name)).toContain('ch1')
  })

  it('when the file is empty then empty_file', () => {
    expect(engineErrorOf(new Uint8Array()).code).toBe('empty_file')
    expect(engineErrorOf(utf8(' \r\n\n\t')).code).toBe('empty_file')
  })

  it('when the file is binary then binary_file', () => {
    const bytes = Uint8Array.from({ length: 512 }, (_, i) => (i * 37) % 256)
    const error = engineErrorOf(bytes)
    expect(error.code).toBe('binary_file')
    expect(error.message).toMatch(/binary/)
  })

  it('when the file is an HTML page then html_file', () => {
    expect(engineErrorOf(utf8('<!DOCTYPE html>\n<html><body>Sign in</body></html>')).code).toBe('html_file')
    expect(engineErrorOf(utf8('  <html>\n<p>1,2</p></html>')).code).toBe('html_file')
  })

  it('when no column holds numbers then no_numeric_data', () => {
    const error = engineErrorOf(utf8('name,colour\nred,apple\ngreen,pear\nblue,sky\nyellow,sun\n'))
    expect(error.code).toBe('no_numeric_data')
  })

  it('when fewer than 16 samples then too_few_samples, saying how many', () => {
    const text = 'Time (s),CH1 (V)\n' + Array.from({ length: 15 }, (_, i) => `${i * 1e-3},${Math.sin(i)}`).join('\n')
    const error = engineErrorOf(utf8(text))
    expect(error.code).toBe('too_few_samples')
    expect(error.message).toContain('15 samples')
  })

  it('when the time axis runs backwards then time_axis_backwards', () => {
    const lines = good.trimEnd().split('\n')
    const reversed = [lines[0], ...lines.slice(1).map((line, i) => {
      const cells = line.split(',')
      cells[0] = String(-i * 1e-6)
      return cells.join(',')
    })]
    expect(engineErrorOf(utf8(reversed.join('\n'))).code).toBe('time_axis_backwards')
  })

  it('when the time axis jumps back half way then time_axis_backwards naming the sample', () => {
    const lines = good.trimEnd().split('\n')
    const jumped = [lines[0], ...lines.slice(1).map((line, i) => {
      const cells = line.split(',')
      cells[0] = String((i % 100) * 2e-6)
      return cells.join(',')
    })]
    const error = engineErrorOf(utf8(jumped.join('\n')))
    expect(error.code).toBe('time_axis_backwards')
    expect(error.message).toContain('sample 100')
  })

  it('when many rows lack columns then inconsistent_columns', () => {
    const lines = good.trimEnd().split('\n')
    const ragged = lines.map((line, row) => (row > 0 && row % 3 === 0 ? line.split(',').slice(0, 2).join(',') : line))
    expect(engineErrorOf(utf8(ragged.join('\n'))).code).toBe('inconsistent_columns')
  })

  it('when a few rows lack columns then the gap is NaN and a warning says so', () => {
    const lines = good.trimEnd().split('\n')
    lines[50] = lines[50].split(',').slice(0, 2).join(',')
    const trace = readTrace(utf8(lines.join('\n')))
    expect(Number.isNaN(trace.channels[2].values[48])).toBe(false)
    expect(Number.isNaN(trace.channels[2].values[49])).toBe(true)
    expect(trace.warnings.map((w) => w.code)).toContain('short_rows')
  })

  it('when the file is larger than the limit then file_too_large', () => {
    const error = engineErrorOf(utf8(good), { maxBytes: 1000 })
    expect(error.code).toBe('file_too_large')
    expect(error.message).toMatch(/MiB/)
  })

  it('when a single column has no interval anywhere then no_sample_interval asks for one', () => {
    const text = Array.from({ length: 40 }, (_, i) => String(Math.sin(i / 3))).join('\n')
    const error = engineErrorOf(utf8(text))
    expect(error.code).toBe('no_sample_interval')
    expect(error.message).toMatch(/interval/)
    expect(readTrace(utf8(text), { sampleIntervalSeconds: 1e-6 }).sampleCount).toBe(40)
  })

  it('when options are nonsense then invalid_option', () => {
    expect(engineErrorOf(utf8(good), { sampleIntervalSeconds: -1 }).code).toBe('invalid_option')
    expect(engineErrorOf(utf8(good), { roles: { ramp: 'laser' as never } }).code).toBe('invalid_option')
  })
})

describe('readTrace on pathological input', () => {
  it('when a file has hundreds of thousands of numeric columns then too_many_columns (and it does not crawl)', () => {
    const error = engineErrorOf(utf8('1.5,'.repeat(300_000)))
    expect(error.code).toBe('too_many_columns')
  })
})

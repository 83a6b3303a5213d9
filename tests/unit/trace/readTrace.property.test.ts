import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { isEngineError } from '../../../shared/errors'
import { formatTraceCsv, type TraceCsvLayout } from '../../../shared/trace/formatTraceCsv'
import { readTrace } from '../../../shared/trace/readTrace'
import { makeSweptTrace } from './makeSweptTrace'

/** Run the reader; any throw must be an EngineError, and a returned trace must be self-consistent. */
function readsOrRefusesCleanly(bytes: Uint8Array): boolean {
  try {
    const trace = readTrace(bytes, { sampleIntervalSeconds: 1e-6 })
    expect(trace.sampleCount).toBeGreaterThanOrEqual(16)
    expect(trace.time).toHaveLength(trace.sampleCount)
    for (const channel of trace.channels) expect(channel.values).toHaveLength(trace.sampleCount)
    expect(trace.sampleInterval).toBeGreaterThan(0)
    return true
  } catch (error) {
    if (!isEngineError(error)) throw error
    expect(error.code).toMatch(/^[a-z0-9_]+$/)
    expect(error.message.length).toBeGreaterThan(10)
    return false
  }
}

const layouts: TraceCsvLayout[] = ['plain-columns', 'headerless-columns', 'preamble-header', 'side-by-side-blocks', 'index-with-interval']
const samples = layouts.map((layout, k) =>
  formatTraceCsv(makeSweptTrace({ sampleCount: 60 + 20 * k, sweeps: 1 }), {
    layout,
    significantDigits: 6,
    ...(k % 2 === 1 ? { delimiter: ';', decimalComma: true } : {}),
  }),
)

/** One edit of a CSV text: insert, delete, replace or duplicate a span. */
const edit = fc.record({
  kind: fc.constantFrom('insert', 'delete', 'replace', 'duplicate'),
  at: fc.nat(),
  length: fc.integer({ min: 0, max: 40 }),
  text: fc.string({ unit: fc.constantFrom(',', ';', '\t', '\n', '\r', '"', '-', '.', 'e', 'E', '0', '9', ' ', 'µ', 'NaN', '\u0000', 'x'), maxLength: 12 }),
})

function applyEdits(text: string, edits: { kind: string; at: number; length: number; text: string }[]): string {
  let out = text
  for (const e of edits) {
    const at = e.at % (out.length + 1)
    const end = Math.min(out.length, at + e.length)
    if (e.kind === 'insert') out = out.slice(0, at) + e.text + out.slice(at)
    else if (e.kind === 'delete') out = out.slice(0, at) + out.slice(end)
    else if (e.kind === 'replace') out = out.slice(0, at) + e.text + out.slice(end)
    else out = out.slice(0, end) + out.slice(at, end) + out.slice(end)
  }
  return out
}

describe('readTrace never fails except with EngineError (fast-check)', () => {
  // Property checks; sizes are kept small so the suite stays quick. fast-check's own run bound is the
  // guard against a hang: each case reads at most a few kB.
  it('when given arbitrary bytes then it returns a trace or throws EngineError', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 2048 }), (bytes) => {
        readsOrRefusesCleanly(bytes)
      }),
      { numRuns: 400 },
    )
  })

  it('when given arbitrary text then it returns a trace or throws EngineError', () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 2048 }), (text) => {
        readsOrRefusesCleanly(new TextEncoder().encode(text))
      }),
      { numRuns: 400 },
    )
  })

  it('when a valid export is mangled by random edits then it returns a trace or throws EngineError', () => {
    let read = 0
    fc.assert(
      fc.property(fc.nat({ max: samples.length - 1 }), fc.array(edit, { minLength: 1, maxLength: 8 }), (which, edits) => {
        if (readsOrRefusesCleanly(new TextEncoder().encode(applyEdits(samples[which], edits)))) read++
      }),
      // A fixed seed keeps the share below reproducible; the other properties run on fresh seeds.
      { numRuns: 600, seed: 20260101 },
    )
    // Small edits (a NUL byte makes a file binary) leave many files readable: the reader repairs, not refuses.
    expect(read).toBeGreaterThan(240)
  })

  it('when numeric-looking lines are shuffled into a file then it returns a trace or throws EngineError', () => {
    const cell = fc.oneof(
      fc.double({ noNaN: false }).map(String),
      fc.integer().map(String),
      fc.constantFrom('', 'NaN', '-inf', '9.9E37', '1e999', '-0.0E-3', '1,5', '"2.5"', 'Time (s)', 'CH1 (mV)'),
    )
    const line = fc.array(cell, { minLength: 1, maxLength: 6 }).map((cells) => cells.join(','))
    fc.assert(
      fc.property(fc.array(line, { minLength: 0, maxLength: 80 }), (lines) => {
        readsOrRefusesCleanly(new TextEncoder().encode(lines.join('\n')))
      }),
      { numRuns: 400 },
    )
  })
})

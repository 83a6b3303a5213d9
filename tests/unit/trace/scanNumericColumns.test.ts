import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { parseQuotedColumns } from '../../../shared/trace/parseQuotedColumns'
import { scanNumericColumns as scanBytes, type ScanNumericColumnsOptions } from '../../../shared/trace/scanNumericColumns'

const scanNumericColumns = (text: string, options: ScanNumericColumnsOptions) => scanBytes(new TextEncoder().encode(text), options)

describe('scanNumericColumns', () => {
  it('when numbers are printed in any decimal form then each reads as the same double as Number()', () => {
    // Exactness rests on Clinger's fast path (PLDI 1990) and falls back to Number() outside it.
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.integer({ min: 1, max: 17 }), (value, digits) => {
        for (const printed of [String(value), value.toPrecision(digits), value.toExponential(digits - 1)]) {
          const read = scanNumericColumns(`${printed}\n`, { columns: [0] }).values[0][0]
          const expected = Math.abs(Number(printed)) >= 9.9e37 ? NaN : Number(printed)
          expect(Object.is(read, expected) || read === expected).toBe(true)
        }
      }),
      { numRuns: 3000 },
    )
  })

  it('when the decimal mark is a comma then "-1,5E-3" reads as -0.0015', () => {
    const scanned = scanNumericColumns('-1,5E-3;2\n', { columns: [0, 1], delimiter: ';', decimalComma: true })
    expect(scanned.values[0][0]).toBe(-0.0015)
    expect(scanned.values[1][0]).toBe(2)
  })

  it('when only some columns are asked for then the others are skipped, words and all', () => {
    const text = 'Source,CH1,,0.1,5\nNote,a b c,,0.2,6\n,,,0.3,7\n'
    const scanned = scanNumericColumns(text, { columns: [4, 3] })
    expect(Array.from(scanned.values[0])).toEqual([5, 6, 7])
    expect(Array.from(scanned.values[1])).toEqual([0.1, 0.2, 0.3])
    expect(scanned.textCells).toBe(0)
  })

  it('when rows are blank, short or wordy then counts say so', () => {
    const text = '1,2\n,\n3\nTime,CH1\n5,6\n\n,\n'
    const scanned = scanNumericColumns(text, { columns: [0, 1] })
    // Row ",": a NaN sample (data follows); "3": short; the header row: skipped; trailing blanks dropped.
    expect(scanned.rowCount).toBe(4)
    expect(Number.isNaN(scanned.values[0][1])).toBe(true)
    expect(Number.isNaN(scanned.values[1][2])).toBe(true)
    expect(scanned.shortRows).toBe(1)
    expect(scanned.firstShortRow).toBe(2)
    expect(scanned.skippedRows).toBe(1)
  })

  it('when a quote appears then it hands over, and the quote-aware reader agrees', () => {
    const text = '1,"2.5"\n3,"4,5"\n'
    expect(scanNumericColumns(text, { columns: [0, 1] }).quoted).toBe(true)
    const parsed = parseQuotedColumns(text, { columns: [0, 1] })
    expect(Array.from(parsed.values[0])).toEqual([1, 3])
    expect(parsed.values[1][0]).toBe(2.5)
    expect(parsed.textCells).toBe(1)
  })
})

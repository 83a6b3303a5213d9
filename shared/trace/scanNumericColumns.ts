import { CellKind, classifyCell } from './classifyCell'
import { createColumnSink, type ScannedColumns } from './createColumnSink'

export interface ScanNumericColumnsOptions {
  /** Character offset of the first body line. @default 0 */
  start?: number
  /** One character: ',', ';' or '\t'. @default ',' */
  delimiter?: string
  /** Read "1,5" as 1.5 (then the delimiter is not a comma). @default false */
  decimalComma?: boolean
  /** 0-based file columns to read; the output arrays follow this order. */
  columns: number[]
}

export type { ScannedColumns } from './createColumnSink'

// Powers of ten that are exact doubles: mantissa (< 2^53) × or ÷ one of them rounds once, so the result equals
// the correctly rounded decimal (Clinger, "How to read floating point numbers accurately", PLDI 1990).
const POW10 = Array.from({ length: 23 }, (_, k) => Number(`1e${k}`))
const MANTISSA_LIMIT = 9e14

const NEWLINE = 10
const RETURN = 13
const QUOTE = 34
const SPACE = 32

/**
 * Read the requested columns of a plain numeric body in one pass over the string with charCodeAt: no per-row
 * arrays, numbers parsed in place (exactly; anything unusual goes through `classifyCell`). Empty lines are
 * skipped; rows with no number in any requested column are skipped and counted; blank rows between data rows
 * become NaN samples. Stops early with `quoted: true` at the first quote character.
 */
export function scanNumericColumns(text: string, options: ScanNumericColumnsOptions): ScannedColumns {
  const { start = 0, delimiter = ',', decimalComma = false, columns } = options
  const delim = delimiter.charCodeAt(0)
  const decimal = decimalComma ? 44 : 46
  const width = columns.length
  let maxColumn = 0
  for (const column of columns) maxColumn = Math.max(maxColumn, column)
  const slotOf = new Int32Array(maxColumn + 1).fill(-1)
  columns.forEach((column, slot) => {
    slotOf[column] = slot
  })

  const n = text.length
  const sink = createColumnSink(width, countLines(text, start) + 1)
  const { rowValues, rowKinds } = sink
  let line = -1
  let pos = start

  while (pos < n) {
    line++
    let c = text.charCodeAt(pos)
    if (c === NEWLINE) {
      pos++
      continue
    }
    if (c === RETURN) {
      pos++
      if (pos < n && text.charCodeAt(pos) === NEWLINE) pos++
      continue
    }
    rowKinds.fill(0)
    let column = 0
    for (;;) {
      const slot = column <= maxColumn ? slotOf[column] : -1
      if (slot >= 0) {
        const fieldStart = pos
        // Inline decimal parser: sign, digits, decimal mark, digits, exponent; spaces around are allowed.
        let p = pos
        while (p < n && text.charCodeAt(p) === SPACE) p++
        let negative = false
        c = p < n ? text.charCodeAt(p) : NEWLINE
        if (c === 45) {
          negative = true
          c = ++p < n ? text.charCodeAt(p) : NEWLINE
        } else if (c === 43) {
          c = ++p < n ? text.charCodeAt(p) : NEWLINE
        }
        let mantissa = 0
        let exponent = 0
        let digits = 0
        let exact = true
        while (c >= 48 && c <= 57) {
          if (mantissa < MANTISSA_LIMIT) mantissa = mantissa * 10 + (c - 48)
          else exact = false
          digits++
          c = ++p < n ? text.charCodeAt(p) : NEWLINE
        }
        if (c === decimal) {
          c = ++p < n ? text.charCodeAt(p) : NEWLINE
          while (c >= 48 && c <= 57) {
            if (mantissa < MANTISSA_LIMIT) {
              mantissa = mantissa * 10 + (c - 48)
              exponent--
            } else if (c !== 48) exact = false
            digits++
            c = ++p < n ? text.charCodeAt(p) : NEWLINE
          }
        }
        if (digits > 0 && (c === 101 || c === 69)) {
          c = ++p < n ? text.charCodeAt(p) : NEWLINE
          let exponentNegative = false
          if (c === 45) {
            exponentNegative = true
            c = ++p < n ? text.charCodeAt(p) : NEWLINE
          } else if (c === 43) {
            c = ++p < n ? text.charCodeAt(p) : NEWLINE
          }
          let written = 0
          let exponentDigits = 0
          while (c >= 48 && c <= 57) {
            if (written < 100000) written = written * 10 + (c - 48)
            exponentDigits++
            c = ++p < n ? text.charCodeAt(p) : NEWLINE
          }
          if (exponentDigits === 0) digits = 0
          exponent += exponentNegative ? -written : written
        }
        while (c === SPACE) c = ++p < n ? text.charCodeAt(p) : NEWLINE
        if (digits > 0 && exact && exponent >= -22 && exponent <= 22 && (c === delim || c === NEWLINE || c === RETURN)) {
          const magnitude = exponent >= 0 ? mantissa * POW10[exponent] : mantissa / POW10[-exponent]
          rowValues[slot] = negative ? -magnitude : magnitude
          rowKinds[slot] = CellKind.Number
          pos = p
        } else {
          // Unusual cell (long mantissa, huge exponent, words, NaN): find its end and classify it slowly.
          pos = fieldStart
          while (pos < n) {
            c = text.charCodeAt(pos)
            if (c === delim || c === NEWLINE || c === RETURN) break
            if (c === QUOTE) return sink.finish(true)
            pos++
          }
          const cell = classifyCell(text.slice(fieldStart, pos), decimalComma)
          rowValues[slot] = cell.value
          rowKinds[slot] = cell.kind
        }
      } else {
        while (pos < n) {
          c = text.charCodeAt(pos)
          if (c === delim || c === NEWLINE || c === RETURN) break
          if (c === QUOTE) return sink.finish(true)
          pos++
        }
      }
      if (pos >= n) break
      c = text.charCodeAt(pos++)
      if (c === delim) {
        column++
        continue
      }
      if (c === RETURN && pos < n && text.charCodeAt(pos) === NEWLINE) pos++
      break
    }

    sink.commitRow(line)
  }
  return sink.finish()
}

function countLines(text: string, start: number): number {
  let count = 0
  let index = text.indexOf('\n', start)
  while (index !== -1) {
    count++
    index = text.indexOf('\n', index + 1)
  }
  if (count === 0) {
    // Old files end lines with a bare carriage return.
    index = text.indexOf('\r', start)
    while (index !== -1) {
      count++
      index = text.indexOf('\r', index + 1)
    }
  }
  return count
}

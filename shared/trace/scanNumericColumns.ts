import { CellKind, classifyCell } from './classifyCell'
import { createColumnSink, type ScannedColumns } from './createColumnSink'

// Local copies: a property read through the imported object costs a call per cell in some module loaders.
const KIND_NUMBER = CellKind.Number

export interface ScanNumericColumnsOptions {
  /** Offset of the first body line: a byte offset for `scanNumericColumns`, a character offset for the
   * quote-aware reader. @default 0 */
  start?: number
  /** Rows expected, to size the arrays (they grow when it is short). @default estimated from line lengths */
  expectedRows?: number
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
 * Read the requested columns of a plain numeric body in one pass over the bytes (UTF-8 and Latin-1 agree on
 * every character a number, delimiter or line end uses): no decoded string, no per-row arrays, numbers parsed
 * in place (exactly; anything unusual goes through `classifyCell`). Empty lines are
 * skipped; rows with no number in any requested column are skipped and counted; blank rows between data rows
 * become NaN samples. Stops early with `quoted: true` at the first quote character.
 */
export function scanNumericColumns(bytes: Uint8Array, options: ScanNumericColumnsOptions): ScannedColumns {
  const { start = 0, delimiter = ',', decimalComma = false, columns, expectedRows } = options
  const delim = delimiter.charCodeAt(0)
  const decimal = decimalComma ? 44 : 46
  const width = columns.length
  let maxColumn = 0
  for (const column of columns) maxColumn = Math.max(maxColumn, column)
  const slotOf = new Int32Array(maxColumn + 1).fill(-1)
  columns.forEach((column, slot) => {
    slotOf[column] = slot
  })

  const n = bytes.length
  // Every row takes at least one byte per requested column, which bounds the first allocation for wide files.
  const rowBound = Math.floor((n - start) / Math.max(1, width)) + 16
  const sink = createColumnSink(width, Math.min(expectedRows ?? estimateRows(bytes, start), rowBound))
  const { rowValues, rowKinds } = sink
  let line = -1
  let pos = start

  while (pos < n) {
    line++
    let c = bytes[pos]
    if (c === NEWLINE) {
      pos++
      continue
    }
    if (c === RETURN) {
      pos++
      if (pos < n && bytes[pos] === NEWLINE) pos++
      continue
    }
    let column = 0
    let numbers = 0
    for (;;) {
      const slot = column <= maxColumn ? slotOf[column] : -1
      if (slot >= 0) {
        const fieldStart = pos
        // Inline decimal parser: sign, digits, decimal mark, digits, exponent; spaces around are allowed.
        // No bounds checks: past the end a typed array reads undefined, which matches no character, so a number
        // cut by the end of the file simply falls to the slow path below.
        let p = pos
        while (p < n && bytes[p] === SPACE) p++
        let negative = false
        c = bytes[p]
        if (c === 45) {
          negative = true
          c = bytes[++p]
        } else if (c === 43) {
          c = bytes[++p]
        }
        let mantissa = 0
        let exponent = 0
        let digits = 0
        let exact = true
        while (c >= 48 && c <= 57) {
          if (mantissa < MANTISSA_LIMIT) mantissa = mantissa * 10 + (c - 48)
          else exact = false
          digits++
          c = bytes[++p]
        }
        if (c === decimal) {
          c = bytes[++p]
          while (c >= 48 && c <= 57) {
            if (mantissa < MANTISSA_LIMIT) {
              mantissa = mantissa * 10 + (c - 48)
              exponent--
            } else if (c !== 48) exact = false
            digits++
            c = bytes[++p]
          }
        }
        if (digits > 0 && (c === 101 || c === 69)) {
          c = bytes[++p]
          let exponentNegative = false
          if (c === 45) {
            exponentNegative = true
            c = bytes[++p]
          } else if (c === 43) {
            c = bytes[++p]
          }
          let written = 0
          let exponentDigits = 0
          while (c >= 48 && c <= 57) {
            if (written < 100000) written = written * 10 + (c - 48)
            exponentDigits++
            c = bytes[++p]
          }
          if (exponentDigits === 0) digits = 0
          exponent += exponentNegative ? -written : written
        }
        while (c === SPACE) c = bytes[++p]
        if (digits > 0 && exact && exponent >= -22 && exponent <= 22 && (c === delim || c === NEWLINE || c === RETURN)) {
          const magnitude = exponent >= 0 ? mantissa * POW10[exponent] : mantissa / POW10[-exponent]
          rowValues[slot] = negative ? -magnitude : magnitude
          rowKinds[slot] = KIND_NUMBER
          numbers++
          pos = p
        } else {
          // Unusual cell (long mantissa, huge exponent, words, NaN): find its end and classify it slowly.
          pos = fieldStart
          while (pos < n) {
            c = bytes[pos]
            if (c === delim || c === NEWLINE || c === RETURN) break
            if (c === QUOTE) return sink.finish(true)
            pos++
          }
          const cell = classifyCell(cellText(bytes, fieldStart, pos), decimalComma)
          rowValues[slot] = cell.value
          rowKinds[slot] = cell.kind
        }
      } else {
        while (pos < n) {
          c = bytes[pos]
          if (c === delim || c === NEWLINE || c === RETURN) break
          if (c === QUOTE) return sink.finish(true)
          pos++
        }
      }
      if (pos >= n) break
      c = bytes[pos++]
      if (c === delim) {
        column++
        continue
      }
      if (c === RETURN && pos < n && bytes[pos] === NEWLINE) pos++
      break
    }

    // Requested columns beyond the last field of a short row hold nothing.
    if (column < maxColumn) for (let k = 0; k < width; k++) if (columns[k] > column) rowKinds[k] = 0
    if (numbers === width) sink.commitNumbers(line)
    else sink.commitRow(line)
  }
  return sink.finish()
}

/**
 * Rows to expect, from line lengths sampled at the start, middle and end of the body (the shortest average
 * wins, so the guess is rarely short); the sink grows if it is.
 */
function estimateRows(bytes: Uint8Array, start: number): number {
  const body = bytes.length - start
  let bytesPerLine = Infinity
  for (const fraction of [0, 0.5, 0.9]) {
    let position = start + Math.floor(body * fraction)
    if (fraction > 0) position = bytes.indexOf(NEWLINE, position) + 1
    if (position <= 0) continue
    const first = position
    let lines = 0
    while (lines < 64 && position < bytes.length) {
      const next = bytes.indexOf(NEWLINE, position)
      if (next < 0) break
      lines++
      position = next + 1
    }
    if (lines > 0) bytesPerLine = Math.min(bytesPerLine, (position - first) / lines)
  }
  if (!Number.isFinite(bytesPerLine)) return 1024
  return Math.ceil((body / bytesPerLine) * 1.02) + 16
}

/** A cell's text for classification: numbers and the words that matter are ASCII, so bytes map to chars. */
function cellText(bytes: Uint8Array, from: number, to: number): string {
  if (to - from > 64) return 'text'
  let text = ''
  for (let i = from; i < to; i++) text += String.fromCharCode(bytes[i])
  return text
}

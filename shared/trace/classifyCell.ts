/** What one printed cell holds, as the reader sees it. */
export const CellKind = {
  /** A finite number. */
  Number: 1,
  /** Empty or whitespace only. */
  Blank: 2,
  /** An explicit not-a-number token ("NaN", "N/A", "-"). */
  Missing: 3,
  /** Out of range: infinity, an over/underflow word, or the ±9.9E37 overflow sentinel. */
  Clipped: 4,
  /** Anything else: words, labels, dates. */
  Text: 5,
} as const
export type CellKind = (typeof CellKind)[keyof typeof CellKind]

export interface ClassifiedCell {
  kind: CellKind
  /** The number for `CellKind.Number`, NaN otherwise. */
  value: number
}

const NUMBER_DOT = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/
const NUMBER_COMMA = /^[+-]?(?:\d+,?\d*|,\d+)(?:[eE][+-]?\d+)?$/
const MISSING = new Set(['nan', '-nan', '+nan', 'n/a', 'na', 'null', 'none', '-', '--', '?', '#n/a', 'nan(ind)'])
const CLIPPED = /^(?:[+-]?inf(?:inity)?|-?1\.#inf|overflow|underflow|over|under|clip(?:ped)?|ovld|overload|[<>]+)$/
/** Oscilloscopes print out-of-range samples as ±9.9E37 (common practice). */
export const OVERFLOW_SENTINEL = 9.9e37

/**
 * Classify one cell of a numeric export and read its number. Decimal commas are accepted when
 * `decimalComma` is set (then "." is not a decimal mark).
 */
export function classifyCell(cell: string, decimalComma = false): ClassifiedCell {
  const trimmed = cell.trim()
  if (trimmed === '') return { kind: CellKind.Blank, value: NaN }
  if (decimalComma ? NUMBER_COMMA.test(trimmed) : NUMBER_DOT.test(trimmed)) {
    const value = Number(decimalComma ? trimmed.replace(',', '.') : trimmed)
    if (!Number.isFinite(value) || Math.abs(value) >= OVERFLOW_SENTINEL) return { kind: CellKind.Clipped, value: NaN }
    return { kind: CellKind.Number, value }
  }
  const lower = trimmed.toLowerCase()
  if (MISSING.has(lower)) return { kind: CellKind.Missing, value: NaN }
  if (CLIPPED.test(lower)) return { kind: CellKind.Clipped, value: NaN }
  return { kind: CellKind.Text, value: NaN }
}

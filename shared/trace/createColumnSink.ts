import { CellKind } from './classifyCell'

// Local copies: a property read through the imported object costs a call per cell in some module loaders.
const KIND_BLANK = CellKind.Blank
const KIND_CLIPPED = CellKind.Clipped
const KIND_MISSING = CellKind.Missing
const KIND_NUMBER = CellKind.Number
const KIND_TEXT = CellKind.Text

/** Columns read from the body, with counts of everything that was not a plain number. */
export interface ScannedColumns {
  values: Float64Array[]
  rowCount: number
  blankCells: number
  missingCells: number
  clippedCells: number
  textCells: number
  /** Rows with too few fields to reach every requested column (their missing cells are NaN). */
  shortRows: number
  /** 0-based sample index of the first short row, -1 when none. */
  firstShortRow: number
  /** Non-empty rows with no number in any requested column (repeated headers, footers). */
  skippedRows: number
  /** 0-based line (from the body start) of the first skipped row, -1 when none. */
  firstSkippedLine: number
  /** True when a quote character was met (the fast scanner then gives up). */
  quoted: boolean
}

/** Collects one row at a time into growing typed arrays; shared by both body readers. */
export interface ColumnSink {
  /** Cell values (NaN unless a number) and kinds (0 = the row was too short to hold the cell). */
  readonly rowValues: Float64Array
  readonly rowKinds: Uint8Array
  /** Take the row held in rowValues/rowKinds; `line` is its 0-based line from the body start. */
  commitRow(line: number): void
  /** Faster `commitRow` for a row known to hold a number in every requested column. */
  commitNumbers(line: number): void
  finish(quoted?: boolean): ScannedColumns
}

/**
 * A row collector: rows with no number in any column are skipped (and counted) when they hold words, and held
 * back when blank: blank rows between data rows become NaN samples, trailing ones are dropped.
 */
export function createColumnSink(width: number, initialCapacity = 1024): ColumnSink {
  let capacity = Math.max(16, initialCapacity)
  let out = Array.from({ length: width }, () => new Float64Array(capacity))
  const rowValues = new Float64Array(width)
  const rowKinds = new Uint8Array(width)
  const counts = {
    blankCells: 0, missingCells: 0, clippedCells: 0, textCells: 0,
    shortRows: 0, firstShortRow: -1, skippedRows: 0, firstSkippedLine: -1,
  }
  let rows = 0
  let pendingBlankRows = 0

  function ensureRoom(): void {
    if (rows < capacity) return
    capacity = Math.ceil(capacity * 1.5)
    out = out.map((array) => {
      const bigger = new Float64Array(capacity)
      bigger.set(array)
      return bigger
    })
  }

  function commitRow(line: number): void {
    let numbers = 0
    let flagged = 0
    let texts = 0
    let absent = 0
    for (let k = 0; k < width; k++) {
      const kind = rowKinds[k]
      if (kind === KIND_NUMBER) numbers++
      else if (kind === KIND_MISSING || kind === KIND_CLIPPED) flagged++
      else if (kind === KIND_TEXT) texts++
      else if (kind === 0) absent++
    }
    if (numbers === 0 && flagged === 0) {
      if (texts > 0) {
        counts.skippedRows++
        if (counts.firstSkippedLine < 0) counts.firstSkippedLine = line
      } else {
        pendingBlankRows++
      }
      return
    }
    while (pendingBlankRows > 0) {
      ensureRoom()
      for (let k = 0; k < width; k++) out[k][rows] = NaN
      counts.blankCells += width
      rows++
      pendingBlankRows--
    }
    ensureRoom()
    for (let k = 0; k < width; k++) {
      const kind = rowKinds[k]
      if (kind === KIND_NUMBER) {
        out[k][rows] = rowValues[k]
        continue
      }
      out[k][rows] = NaN
      if (kind === KIND_BLANK) counts.blankCells++
      else if (kind === KIND_MISSING) counts.missingCells++
      else if (kind === KIND_CLIPPED) counts.clippedCells++
      else if (kind === KIND_TEXT) counts.textCells++
    }
    if (absent > 0) {
      counts.shortRows++
      if (counts.firstShortRow < 0) counts.firstShortRow = rows
    }
    rows++
  }

  function finish(quoted = false): ScannedColumns {
    return { values: out.map((array) => trimArray(array, rows)), rowCount: rows, ...counts, quoted }
  }

  function commitNumbers(line: number): void {
    if (pendingBlankRows > 0 || rows >= capacity) {
      commitRow(line)
      return
    }
    for (let k = 0; k < width; k++) out[k][rows] = rowValues[k]
    rows++
  }

  return { rowValues, rowKinds, commitRow, commitNumbers, finish }
}

/** Cut to length; copy only when much of the buffer would be wasted. */
function trimArray(array: Float64Array, length: number): Float64Array {
  if (length === array.length) return array
  return length < array.length * 0.9 ? array.slice(0, length) : array.subarray(0, length)
}

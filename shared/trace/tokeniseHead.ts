import Papa from 'papaparse'
import { CellKind, classifyCell } from './classifyCell'

/** The head of an export split into lines and cells, and the delimiter and decimal mark that fit it best. */

export interface HeadLine {
  offset: number
  text: string
}

export interface TokenisedLine {
  offset: number
  cells: string[]
  kinds: CellKind[]
}

const DELIMITERS = [',', ';', '\t']

export function splitHead(text: string, maxLines: number): HeadLine[] {
  const lines: HeadLine[] = []
  let offset = text.charCodeAt(0) === 0xfeff ? 1 : 0
  while (offset < text.length && lines.length < maxLines) {
    let end = offset
    while (end < text.length) {
      const c = text.charCodeAt(end)
      if (c === 10 || c === 13) break
      end++
    }
    lines.push({ offset, text: text.slice(offset, end) })
    if (end < text.length && text.charCodeAt(end) === 13 && text.charCodeAt(end + 1) === 10) end++
    offset = end + 1
  }
  return lines
}

export function tokenise(line: HeadLine, delimiter: string, decimalComma: boolean): TokenisedLine {
  const cells = line.text.includes('"')
    ? ((Papa.parse<string[]>(line.text, { delimiter }).data[0] as string[] | undefined) ?? [''])
    : line.text.split(delimiter)
  return { offset: line.offset, cells, kinds: cells.map((cell) => classifyCell(cell, decimalComma).kind) }
}

/** Pick the delimiter whose split of the lower part of the head is most consistent and most numeric. */
export function chooseDelimiter(lines: HeadLine[]): { delimiter: string; decimalComma: boolean; singleColumn: boolean } {
  const usable = lines.filter((line) => line.text.trim() !== '')
  const tail = usable.slice(Math.floor(usable.length * 0.4))
  let best = { delimiter: ',', decimalComma: false, score: 0 }
  for (const delimiter of DELIMITERS) {
    const decimalComma = delimiter !== ',' && prefersDecimalComma(tail, delimiter)
    const tokenised = tail.map((line) => tokenise(line, delimiter, decimalComma))
    const counts = tokenised.map((row) => row.cells.length)
    const mode = modeOf(counts)
    if (mode < 2) continue
    const consistent = counts.filter((count) => count === mode).length / counts.length
    const clean =
      tokenised.filter((row) => row.kinds.includes(CellKind.Number) && !row.kinds.includes(CellKind.Text)).length /
      tokenised.length
    const score = consistent * clean
    if (score > best.score) best = { delimiter, decimalComma, score }
  }
  if (best.score >= 0.5) {
    if (best.delimiter === ',' && looksLikeCommaDecimals(tail)) return { delimiter: ';', decimalComma: true, singleColumn: true }
    return { delimiter: best.delimiter, decimalComma: best.decimalComma, singleColumn: false }
  }
  // One value per line: the delimiter only matters for preamble lines.
  const decimalComma = prefersDecimalComma(tail, ';')
  const preambleDelimiter = DELIMITERS.find((d) => usable.some((line) => line.text.includes(d))) ?? ','
  return { delimiter: decimalComma ? ';' : preambleDelimiter, decimalComma, singleColumn: true }
}

function prefersDecimalComma(lines: HeadLine[], delimiter: string): boolean {
  let comma = 0
  let dot = 0
  for (const line of lines) {
    for (const cell of line.text.split(delimiter)) {
      if (/^\s*[+-]?\d*,\d+(?:[eE][+-]?\d+)?\s*$/.test(cell)) comma++
      else if (/^\s*[+-]?\d*\.\d+(?:[eE][+-]?\d+)?\s*$/.test(cell)) dot++
    }
  }
  return comma > dot
}

/**
 * A single column written with decimal commas splits on "," into integer and fraction digits. Two integer
 * columns (index and counts) look the same, so ask for a telling sign: a fraction with a leading zero, an
 * exponent, or more digits than any counter prints; and a first field that does not count up by one.
 */
function looksLikeCommaDecimals(lines: HeadLine[]): boolean {
  if (lines.length < 2) return false
  let telling = 0
  let counting = 0
  let previous = NaN
  for (const line of lines) {
    const match = /^\s*([+-]?\d+),(\d+(?:[eE][+-]?\d+)?)\s*$/.exec(line.text)
    if (!match) return false
    if (/^0|[eE]|\d{6}/.test(match[2])) telling++
    const whole = Number(match[1])
    if (whole === previous + 1) counting++
    previous = whole
  }
  return telling > 0 && counting < lines.length / 2
}

/** The most frequent value (the larger on a tie). */
export function modeOf(values: number[]): number {
  const counts = new Map<number, number>()
  let best = 0
  let bestCount = 0
  for (const value of values) {
    const count = (counts.get(value) ?? 0) + 1
    counts.set(value, count)
    if (count > bestCount || (count === bestCount && value > best)) {
      best = value
      bestCount = count
    }
  }
  return best
}

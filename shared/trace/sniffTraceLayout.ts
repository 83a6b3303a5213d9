import { EngineError, type EngineWarning } from '../errors'
import { CellKind, classifyCell } from './classifyCell'
import { silentColumns } from './silentColumns'
import { parseUnit } from './parseUnit'
import { readHeaderTiming } from './readHeaderTiming'
import { chooseDelimiter, modeOf, splitHead, tokenise, type TokenisedLine } from './tokeniseHead'

/** One channel column as the sniffer understood it. */
export interface SniffedChannel {
  /** 0-based file column. */
  column: number
  name: string
  /** Unit after conversion ('V' for mV) or as printed. */
  unit: string
  /** Multiply printed values by this to get `unit`. */
  scale: number
}

/** Everything the body reader needs, found from the first few hundred lines. */
export interface TraceLayout {
  layout: 'columns' | 'side-by-side-blocks' | 'single-column'
  delimiter: string
  decimalComma: boolean
  /** Character offset of the first data line. */
  bodyStart: number
  /** 0-based column of the printed time axis, or of a sample index, or null when neither. */
  timeColumn: number | null
  timeKind: 'time' | 'index' | null
  /** Seconds per printed time unit (1e-3 for a column in ms). */
  timeScale: number
  channels: SniffedChannel[]
  metadata: Record<string, string>
  /** True when a header row named the columns. */
  hasHeader: boolean
  /** Oddities of the layout worth telling the user (e.g. channel blocks on different time axes). */
  warnings: EngineWarning[]
}

export interface SniffTraceLayoutOptions {
  /** How many lines to inspect. @default 400 */
  headLines?: number
}

/** Oscilloscopes record a few channels and DAQ cards a few dozen; far more columns is not a trace. */
const MAX_DATA_COLUMNS = 256
const TIME_NAME = /^(?:time|t|x|sec|secs|second|seconds|horizontal|zeit|temps|tiempo)\b|\btime\b/i
const INDEX_NAME = /^(?:index|idx|sample|samples|sample no\.?|sample number|point|points|pt|n|no\.?|nr\.?|#|i)$/i
const CHANNEL_NAME_KEY = /^(?:source|channel|name|label|trace|signal)$/i
const VALUE_UNIT_KEY = /^(?:vertical|y|amplitude|voltage|value)?\s*units?$/i
const TIME_UNIT_KEY = /^(?:horizontal|x|time)\s*units?$/i
const COMMENT_MARK = /^\s*(?:#+|%+|\/\/|;+)\s*/

/**
 * Work out the layout of a text export from its first lines: delimiter (papaparse tokenises each candidate),
 * decimal mark, preamble of key/value metadata, header row (and a units row under it), which columns hold
 * numbers, side-by-side channel blocks that repeat their own metadata and time columns, and whether the first
 * numeric column is a time axis, a sample index or a channel.
 */
export function sniffTraceLayout(text: string, options: SniffTraceLayoutOptions = {}): TraceLayout {
  const { headLines: maxLines = 400 } = options
  const lines = splitHead(text, maxLines)
  const { delimiter, decimalComma, singleColumn } = chooseDelimiter(lines)
  const rows = lines.map((line) => tokenise(line, delimiter, decimalComma))
  const nonEmpty = rows.filter((row) => row.cells.some((cell) => cell.trim() !== ''))
  const tail = nonEmpty.slice(Math.floor(nonEmpty.length * 0.4))

  const dataColumns = findDataColumns(tail, singleColumn)
  if (dataColumns.length > MAX_DATA_COLUMNS) {
    throw new EngineError(
      'too_many_columns',
      `The file has ${dataColumns.length} numeric columns; a trace export has at most ${MAX_DATA_COLUMNS} (this looks like a matrix or an image, not channels over time).`,
    )
  }
  // A channel that printed only NaN (switched off, or out of range the whole time) is not numeric, so without this
  // check the time column left alone would be read as the signal and the message would speak of a missing time axis.
  const silent = silentColumns(tail)
  if (silent.length > 0 && dataColumns.length <= 1) {
    const which = silent.map((column) => column + 1).join(', ')
    throw new EngineError(
      'no_signal',
      `Column${silent.length === 1 ? '' : 's'} ${which} of the file hold${silent.length === 1 ? 's' : ''} only NaN or out-of-range values: there is no signal to analyse. Check that the channel was on and in range when the export was saved.`,
    )
  }
  if (dataColumns.length === 0) {
    throw new EngineError('no_numeric_data', 'The file has no column of numbers: nothing in it can be read as samples.')
  }
  const bodyIndex = findBodyStart(nonEmpty, dataColumns)
  if (bodyIndex < 0) {
    throw new EngineError('no_numeric_data', 'The file has no run of numeric rows: nothing in it can be read as samples.')
  }

  // Header (and an optional units row right under it) just above the body; everything above is preamble.
  let names: string[] | null = null
  let units: string[] | null = null
  let preambleEnd = bodyIndex
  const above = nonEmpty[bodyIndex - 1]
  if (above && isHeaderRow(above, dataColumns)) {
    const twoAbove = nonEmpty[bodyIndex - 2]
    if (twoAbove && isUnitsRow(above, dataColumns) && isHeaderRow(twoAbove, dataColumns)) {
      names = twoAbove.cells
      units = above.cells
      preambleEnd = bodyIndex - 2
    } else {
      names = above.cells
      preambleEnd = bodyIndex - 1
    }
  }
  const metadata: Record<string, string> = {}
  for (const row of nonEmpty.slice(0, preambleEnd)) addPreambleEntry(metadata, row.cells)

  // Data columns form runs; each run has the non-numeric columns before it as its own metadata block.
  const body = nonEmpty.slice(bodyIndex)
  const runs = splitRuns(dataColumns)
  const blockMeta = runs.map((run, k) => readBlockMetadata(body, k === 0 ? 0 : runs[k - 1].at(-1)! + 1, run[0]))
  const headValues = (column: number): number[] =>
    body.map((row) => (row.kinds[column] === CellKind.Number ? classifyCell(row.cells[column], decimalComma).value : NaN))
  const headerTiming = readHeaderTiming({ ...metadata, ...blockMeta[0] })

  const blocksLedByTime =
    runs.length >= 2 &&
    runs.every((run) => run.length >= 2 && (isTimeName(names?.[run[0]]) || isUniformAxis(headValues(run[0]))))
  const groups = blocksLedByTime ? runs : [dataColumns]
  const layout: TraceLayout['layout'] = blocksLedByTime ? 'side-by-side-blocks' : singleColumn ? 'single-column' : 'columns'

  // Decide what the first numeric column is.
  let timeColumn: number | null = null
  let timeKind: TraceLayout['timeKind'] = null
  const first = groups[0][0]
  if (blocksLedByTime) {
    timeColumn = first
    timeKind = 'time'
  } else if (groups[0].length >= 2) {
    const name = names?.[first]
    const values = headValues(first)
    if (name !== undefined && name.trim() !== '') {
      if (isTimeName(name)) timeKind = 'time'
      else if (INDEX_NAME.test(stripUnit(name).name)) timeKind = 'index'
    } else if (isIndexAxis(values)) {
      timeKind = 'index'
    } else if (isUniformAxis(values)) {
      const step = medianStep(values)
      const stated = headerTiming.intervalSeconds
      if (stated === null || Math.abs(step - stated) <= 0.05 * stated) timeKind = 'time'
    }
    if (timeKind !== null) timeColumn = first
  }

  // Units: header cell "(mV)", a units row, block metadata "Vertical Units", or preamble keys.
  const preambleValueUnit = findValue(metadata, VALUE_UNIT_KEY)
  const preambleTimeUnit = findValue(metadata, TIME_UNIT_KEY)
  let timeScale = 1
  if (timeColumn !== null && timeKind === 'time') {
    const printed =
      units?.[timeColumn]?.trim() ||
      stripUnit(names?.[timeColumn] ?? '').unit ||
      findValue(blockMeta[0], TIME_UNIT_KEY) ||
      preambleTimeUnit
    const parsed = parseUnit(printed)
    if (parsed.kind === 'time') timeScale = parsed.scale
  }

  const channels: SniffedChannel[] = []
  const blockChannelIndex: number[] = []
  groups.forEach((group, k) => {
    const meta = blocksLedByTime ? blockMeta[k] : blockMeta[0]
    const columns = group.filter((column, j) => column !== timeColumn && !(blocksLedByTime && j === 0))
    // A block's "Source"/"Channel" entry names its channel only when the block holds exactly one.
    const blockName = columns.length === 1 ? findValue(meta, CHANNEL_NAME_KEY) : undefined
    blockChannelIndex.push(channels.length)
    for (const column of columns) {
      const header = stripUnit(names?.[column] ?? '')
      const name = header.name || blockName || `CH${channels.length + 1}`
      const printedUnit = units?.[column]?.trim() || header.unit || findValue(meta, VALUE_UNIT_KEY) || preambleValueUnit
      const parsed = parseUnit(printedUnit)
      channels.push({ column, name, unit: parsed.unit, scale: parsed.scale })
    }
  })
  if (channels.length === 0) {
    throw new EngineError('no_numeric_data', 'The file has a time or index column but no channel of samples beside it.')
  }
  makeNamesUnique(channels)
  mergeBlockMetadata(metadata, blockMeta, blocksLedByTime ? blockChannelIndex.map((k) => channels[k]?.name ?? '') : null)

  const warnings: EngineWarning[] = []
  if (blocksLedByTime) {
    const reference = headValues(groups[0][0])
    const step = medianStep(reference)
    groups.slice(1).forEach((group, k) => {
      const other = headValues(group[0])
      let worst = 0
      for (let i = 0; i < Math.min(reference.length, other.length); i++) {
        const gap = Math.abs(other[i] - reference[i])
        if (gap > worst) worst = gap
      }
      // A lone printing glitch shows up in every block alike; a shift of half a sample or more is real.
      const disagreeing = reference.filter((value, i) => Math.abs(other[i] - value) > 0.5 * step).length
      if (disagreeing > 2) {
        const name = channels[blockChannelIndex[k + 1]]?.name ?? `block ${k + 2}`
        warnings.push({
          code: 'block_times_differ',
          message: `The time column of ${name}'s block differs from the first block's by up to ${(worst * timeScale).toPrecision(3)} s; all channels were put on the first block's time axis.`,
        })
      }
    })
  }

  return {
    warnings,
    layout,
    delimiter,
    decimalComma,
    bodyStart: body[0].offset,
    timeColumn,
    timeKind,
    timeScale,
    channels,
    metadata,
    hasHeader: names !== null,
  }
}

function findDataColumns(tail: TokenisedLine[], singleColumn: boolean): number[] {
  if (singleColumn) return tail.some((row) => row.kinds[0] === CellKind.Number) ? [0] : []
  const width = modeOf(tail.map((row) => row.cells.length))
  const columns: number[] = []
  for (let column = 0; column < width; column++) {
    let numbers = 0
    let texts = 0
    for (const row of tail) {
      const kind = row.kinds[column]
      if (kind === CellKind.Number) numbers++
      else if (kind === CellKind.Text) texts++
    }
    if (numbers >= 0.5 * tail.length && texts <= 0.1 * tail.length) columns.push(column)
  }
  return columns
}

function isDataRow(row: TokenisedLine, dataColumns: number[]): boolean {
  let numbers = 0
  for (const column of dataColumns) {
    const kind = row.kinds[column]
    if (kind === CellKind.Text) return false
    if (kind === CellKind.Number) numbers++
  }
  return numbers > 0
}

function findBodyStart(rows: TokenisedLine[], dataColumns: number[]): number {
  for (let i = 0; i < rows.length; i++) {
    if (!isDataRow(rows[i], dataColumns)) continue
    const following = rows.slice(i + 1, i + 4)
    if (following.every((row) => isDataRow(row, dataColumns))) return i
  }
  return -1
}

function isHeaderRow(row: TokenisedLine, dataColumns: number[]): boolean {
  const texts = dataColumns.filter((column) => row.kinds[column] === CellKind.Text).length
  return texts > 0 && texts >= dataColumns.length / 2
}

function isUnitsRow(row: TokenisedLine, dataColumns: number[]): boolean {
  return dataColumns.every((column) => {
    const cell = (row.cells[column] ?? '').trim()
    if (cell === '') return true
    const kind = parseUnit(cell).kind
    return kind !== 'other' || /^[([].*[)\]]$/.test(cell)
  })
}

/** "CH1 (mV)", "Voltage [V]", "Time/ms" → name and unit. */
function stripUnit(header: string): { name: string; unit: string | undefined } {
  const trimmed = header.trim()
  const bracketed = /^(.*?)\s*[([]\s*([^)\]]*?)\s*[)\]]\s*$/.exec(trimmed)
  if (bracketed) return { name: bracketed[1].trim(), unit: bracketed[2] }
  const slashed = /^(.*?)\s*\/\s*([^/\s]+)$/.exec(trimmed)
  if (slashed && parseUnit(slashed[2]).kind !== 'other') return { name: slashed[1].trim(), unit: slashed[2] }
  // Script-written headers put the unit after an underscore: time_s, ramp_V, transmission_mV.
  const suffixed = /^(.*?[^_\s])_([A-Za-z\u00b5\u03bc]+)$/.exec(trimmed)
  if (suffixed && parseUnit(suffixed[2]).kind !== 'other') return { name: suffixed[1], unit: suffixed[2] }
  return { name: trimmed, unit: undefined }
}

function isTimeName(header: string | undefined): boolean {
  if (header === undefined) return false
  const { name, unit } = stripUnit(header)
  return TIME_NAME.test(name) || parseUnit(name).kind === 'time' || (name === '' && parseUnit(unit).kind === 'time')
}

function addPreambleEntry(metadata: Record<string, string>, cells: string[]): void {
  const filled = cells.map((cell) => cell.trim()).filter((cell) => cell !== '')
  if (filled.length === 0) return
  let key = filled[0].replace(COMMENT_MARK, '')
  let value = filled.slice(1).join(' ')
  if (filled.length === 1) {
    const split = /^(.*?)\s*[:=]\s*(.*)$/.exec(key)
    if (split) {
      key = split[1]
      value = split[2]
    }
  }
  key = key.replace(/\s*:$/, '').trim()
  if (key === '') return
  let unique = key
  for (let k = 2; unique in metadata; k++) unique = `${key} (${k})`
  metadata[unique] = value
}

function splitRuns(columns: number[]): number[][] {
  const runs: number[][] = []
  for (const column of columns) {
    const last = runs.at(-1)
    if (last && last.at(-1) === column - 1) last.push(column)
    else runs.push([column])
  }
  return runs
}

/** Key/value pairs printed in the non-numeric columns [from, to) of the body rows. */
function readBlockMetadata(body: TokenisedLine[], from: number, to: number): Record<string, string> {
  const metadata: Record<string, string> = {}
  if (to <= from) return metadata
  for (const row of body) addPreambleEntry(metadata, row.cells.slice(from, to))
  return metadata
}

/** Block keys that agree across blocks are kept once; others are prefixed with the block's channel name. */
function mergeBlockMetadata(metadata: Record<string, string>, blocks: Record<string, string>[], names: string[] | null): void {
  if (names === null || blocks.length < 2) {
    for (const [key, value] of Object.entries(blocks[0] ?? {})) if (!(key in metadata)) metadata[key] = value
    return
  }
  const keys = new Set(blocks.flatMap((block) => Object.keys(block)))
  for (const key of keys) {
    const values = blocks.map((block) => block[key])
    if (values.every((value) => value === values[0])) {
      if (!(key in metadata)) metadata[key] = values[0]
    } else {
      values.forEach((value, k) => {
        if (value !== undefined) metadata[`${names[k] ?? `CH${k + 1}`} ${key}`] = value
      })
    }
  }
}

function findValue(metadata: Record<string, string> | undefined, key: RegExp): string | undefined {
  if (!metadata) return undefined
  for (const [name, value] of Object.entries(metadata)) if (key.test(name.trim())) return value
  return undefined
}

function makeNamesUnique(channels: SniffedChannel[]): void {
  const seen = new Map<string, number>()
  for (const channel of channels) {
    const count = (seen.get(channel.name) ?? 0) + 1
    seen.set(channel.name, count)
    if (count > 1) channel.name = `${channel.name} #${count}`
  }
}

function finiteSteps(values: number[]): number[] {
  const steps: number[] = []
  for (let i = 1; i < values.length; i++) {
    const step = values[i] - values[i - 1]
    if (Number.isFinite(step)) steps.push(step)
  }
  return steps
}

function medianStep(values: number[]): number {
  const steps = finiteSteps(values).sort((a, b) => a - b)
  return steps.length === 0 ? NaN : steps[Math.floor(steps.length / 2)]
}

/** Increasing in near-equal steps (a stray glitch or two allowed): a printed time axis. */
function isUniformAxis(values: number[]): boolean {
  const steps = finiteSteps(values)
  if (steps.length < 3) return false
  const median = medianStep(values)
  if (!(median > 0)) return false
  const close = steps.filter((step) => Math.abs(step - median) <= 0.01 * median).length
  return close >= 0.8 * steps.length
}

/** Whole numbers counting up by one: a sample index. */
function isIndexAxis(values: number[]): boolean {
  const finite = values.filter(Number.isFinite)
  return finite.length >= 3 && finite.every(Number.isInteger) && medianStep(values) === 1
}

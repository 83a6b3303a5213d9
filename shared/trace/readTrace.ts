import { EngineError, type EngineWarning } from '../errors'
import { buildTimeAxis } from './buildTimeAxis'
import { decodeTraceText } from './decodeTraceText'
import { detectChannelRole } from './detectChannelRole'
import { parseQuotedColumns } from './parseQuotedColumns'
import { readHeaderTiming } from './readHeaderTiming'
import { scanNumericColumns, type ScannedColumns } from './scanNumericColumns'
import { sniffTraceLayout, type TraceLayout } from './sniffTraceLayout'
import { transcodeUtf16 } from './transcodeUtf16'
import type { ChannelRole, ReadTraceOptions, Trace, TraceChannel } from './types'

/** Fewer samples than this cannot hold a sweep worth analysing. */
export const MIN_SAMPLES = 16
const DEFAULT_MAX_BYTES = 200 * 1024 * 1024
/** Lines decoded and inspected to find the layout. */
const HEAD_LINES = 400
/** Short rows beyond this share of the body mean the columns do not line up. */
const MAX_SHORT_ROW_SHARE = 0.05
const ROLES: readonly ChannelRole[] = ['transmission', 'ramp', 'reflection', 'unknown']

/**
 * Read an oscilloscope or DAQ text export: bytes in, typed trace out. The layout is detected (preamble,
 * header, delimiter, decimal mark, side-by-side channel blocks, time/index/no time column, units); the body is
 * read straight into Float64Arrays; the time axis is checked and repaired; channel roles are guessed with
 * evidence and can be overridden. Bad input throws `EngineError`; oddities become warnings.
 */
export function readTrace(input: Uint8Array, options: ReadTraceOptions = {}): Trace {
  const { sampleIntervalSeconds, maxBytes = DEFAULT_MAX_BYTES, roles = {} } = options
  assertOptions(sampleIntervalSeconds, maxBytes, roles)
  if (!(input instanceof Uint8Array)) {
    throw new EngineError('invalid_input', 'The trace must be given as bytes (a Uint8Array).')
  }
  if (input.length > maxBytes) {
    throw new EngineError('file_too_large', `The file is ${(input.length / 2 ** 20).toFixed(1)} MiB, more than the limit of ${(maxBytes / 2 ** 20).toFixed(1)} MiB.`)
  }
  const bytes = transcodeUtf16(input)

  // Only the first lines are decoded to text; the body is read straight from the bytes.
  const head = decodeTraceText(bytes, { maxBytes, headLines: HEAD_LINES })
  const { encoding } = head
  const layout = sniffTraceLayout(head.text, { headLines: HEAD_LINES })
  const columns = layout.timeColumn !== null && layout.timeKind === 'time' ? [layout.timeColumn] : []
  const firstChannel = columns.length
  for (const channel of layout.channels) columns.push(channel.column)

  const readOptions = { delimiter: layout.delimiter, decimalComma: layout.decimalComma, columns }
  let scanned = scanNumericColumns(bytes, { ...readOptions, start: head.byteOffset(layout.bodyStart) })
  if (scanned.quoted) {
    const whole = head.complete ? head : decodeTraceText(bytes, { maxBytes })
    scanned = parseQuotedColumns(whole.text, { ...readOptions, start: layout.bodyStart })
  }
  const n = scanned.rowCount
  assertBody(scanned, layout)

  const warnings: EngineWarning[] = []
  if (encoding === 'latin-1') {
    warnings.push({ code: 'latin1_decoded', message: 'The file is not valid UTF-8; it was read as Latin-1 (Windows-1252).' })
  }
  warnings.push(...layout.warnings, ...describeCells(scanned))

  const channels: TraceChannel[] = layout.channels.map((sniffed, k) => {
    const values = scanned.values[firstChannel + k]
    if (sniffed.scale !== 1) for (let i = 0; i < n; i++) values[i] *= sniffed.scale
    return { name: sniffed.name, unit: sniffed.unit, values, role: 'unknown', roleEvidence: '' }
  })

  const timing = readHeaderTiming(layout.metadata)
  let printedTimes: Float64Array | null = null
  if (firstChannel === 1) {
    printedTimes = scanned.values[0]
    if (layout.timeScale !== 1) for (let i = 0; i < n; i++) printedTimes[i] *= layout.timeScale
  }
  const axis = buildTimeAxis({
    sampleCount: n,
    printedTimes,
    headerIntervalSeconds: timing.intervalSeconds,
    headerIntervalKey: timing.intervalKey,
    headerStartSeconds: timing.startSeconds,
    optionIntervalSeconds: sampleIntervalSeconds,
  })
  warnings.push(...axis.warnings, ...intervalDoubts(axis.sampleInterval))

  assignRoles(channels, roles)
  return {
    sampleCount: n,
    sampleInterval: axis.sampleInterval,
    startTime: axis.startTime,
    time: axis.time,
    channels,
    metadata: layout.metadata,
    warnings,
  }
}

function assertOptions(interval: number | undefined, maxBytes: number, roles: Record<string, ChannelRole>): void {
  if (interval !== undefined && !(typeof interval === 'number' && Number.isFinite(interval) && interval > 0)) {
    throw new EngineError('invalid_option', `The sample interval must be a positive number of seconds, not ${String(interval)}.`)
  }
  if (!(typeof maxBytes === 'number' && maxBytes > 0)) {
    throw new EngineError('invalid_option', `The size limit must be a positive number of bytes, not ${String(maxBytes)}.`)
  }
  if (roles === null || typeof roles !== 'object') {
    throw new EngineError('invalid_option', 'Channel roles must be given as an object from channel name or index to role.')
  }
  for (const [key, role] of Object.entries(roles)) {
    if (!ROLES.includes(role)) {
      throw new EngineError('invalid_option', `The role "${String(role)}" for channel "${key}" is not one of ${ROLES.join(', ')}.`)
    }
  }
}

/**
 * A swept-cavity record samples at nanoseconds to milliseconds (sweeps of Hz to kHz; common practice, no published
 * source); an interval outside 1 ps … 1 s is more likely a wrong time unit or a mistyped --interval.
 */
function intervalDoubts(intervalSeconds: number): EngineWarning[] {
  if (intervalSeconds >= 1e-12 && intervalSeconds <= 1) return []
  return [
    {
      code: 'implausible_interval',
      message: `The sample interval is ${intervalSeconds.toPrecision(3)} s, outside what a swept-cavity record uses (about 1 ns to 1 ms); check the time unit in the file or the interval given. Times and linewidths in seconds follow from it.`,
    },
  ]
}

function assertBody(scanned: ScannedColumns, layout: TraceLayout): void {
  const n = scanned.rowCount
  if (n > 0 && scanned.shortRows > Math.max(2, n * MAX_SHORT_ROW_SHARE)) {
    throw new EngineError(
      'inconsistent_columns',
      `${scanned.shortRows} of ${n} rows have fewer columns than the ${layout.channels.length + (layout.timeColumn === null ? 0 : 1)} the file starts with (first at sample ${scanned.firstShortRow}); the columns cannot be lined up.`,
    )
  }
  if (n < MIN_SAMPLES) {
    throw new EngineError('too_few_samples', `The file holds ${n} sample${n === 1 ? '' : 's'}; at least ${MIN_SAMPLES} are needed.`)
  }
  const anyFinite = scanned.values.some((values) => values.some(Number.isFinite))
  if (!anyFinite) throw new EngineError('no_numeric_data', 'Every sample in the file is blank or not a number.')
}

function describeCells(scanned: ScannedColumns): EngineWarning[] {
  const warnings: EngineWarning[] = []
  const blank = scanned.blankCells + scanned.missingCells + scanned.textCells
  if (blank > 0) {
    warnings.push({ code: 'missing_samples', message: `${blank} sample value${blank === 1 ? ' was' : 's were'} blank or not a number and are kept as NaN.` })
  }
  if (scanned.clippedCells > 0) {
    warnings.push({ code: 'clipped_samples', message: `${scanned.clippedCells} sample value${scanned.clippedCells === 1 ? ' was' : 's were'} out of range (clipped or overflowed) and are kept as NaN.` })
  }
  if (scanned.shortRows > 0) {
    warnings.push({ code: 'short_rows', message: `${scanned.shortRows} row${scanned.shortRows === 1 ? ' was' : 's were'} missing columns (first at sample ${scanned.firstShortRow}); the missing values are NaN.` })
  }
  if (scanned.skippedRows > 0) {
    warnings.push({ code: 'skipped_rows', message: `${scanned.skippedRows} row${scanned.skippedRows === 1 ? '' : 's'} inside the data held no numbers (first at body line ${scanned.firstSkippedLine}) and ${scanned.skippedRows === 1 ? 'was' : 'were'} skipped.` })
  }
  return warnings
}

function assignRoles(channels: TraceChannel[], roles: Record<string, ChannelRole>): void {
  const known = new Set<string>()
  channels.forEach((channel, k) => {
    known.add(channel.name)
    known.add(String(k))
    const forced = roles[channel.name] ?? roles[String(k)]
    if (forced !== undefined) {
      channel.role = forced
      channel.roleEvidence = 'set by the user'
      return
    }
    const guess = detectChannelRole(channel.values)
    channel.role = guess.role
    channel.roleEvidence = guess.evidence
  })
  for (const key of Object.keys(roles)) {
    if (!known.has(key)) {
      const names = channels.map((channel, k) => `${k} "${channel.name}"`).join(', ')
      throw new EngineError('unknown_channel', `A role was set for channel "${key}", but the file's channels are ${names}.`)
    }
  }
}

import { EngineError } from '../errors'

/** The export layouts the reader understands, by generic name. */
export type TraceCsvLayout =
  | 'plain-columns'
  | 'headerless-columns'
  | 'preamble-header'
  | 'side-by-side-blocks'
  | 'index-with-interval'
  | 'single-column'

/** Anything trace-like: a `Trace`, or plain arrays from a generator. Values in volts, times in seconds. */
export interface TraceCsvInput {
  sampleInterval: number
  /** Seconds. @default time[0] when `time` is given, else 0 */
  startTime?: number
  /** Printed time of each sample, seconds; @default startTime + i × sampleInterval */
  time?: ArrayLike<number>
  channels: { name: string; unit?: string; values: ArrayLike<number> }[]
  metadata?: Record<string, string>
}

export interface FormatTraceCsvOptions {
  /** @default 'plain-columns' */
  layout?: TraceCsvLayout
  /** @default ',' (';' when decimalComma is set) */
  delimiter?: ',' | ';' | '\t'
  /** Write 1,5 instead of 1.5. @default false */
  decimalComma?: boolean
  /** @default '\n' */
  lineEnding?: '\n' | '\r\n' | '\r'
  /** Significant digits of every number. @default 12 */
  significantDigits?: number
  /** 'shortest' (1.5e-7 or 0.0015), 'exponent' (1.50000E-7) or 'engineering' (-12.8799994E-3). @default 'shortest' */
  numberStyle?: 'shortest' | 'exponent' | 'engineering'
  /** Unit of the printed time column. @default 's' */
  timeUnit?: 's' | 'ms' | 'us' | 'µs' | 'ns'
  /** Unit of printed voltages (channels whose unit is 'V' or unset). @default 'V' */
  valueUnit?: 'V' | 'mV'
}

const TIME_FACTORS = { s: 1, ms: 1e3, us: 1e6, 'µs': 1e6, ns: 1e9 } as const
const VALUE_FACTORS = { V: 1, mV: 1e3 } as const

/**
 * Write a trace as a text export in one of the layouts the reader detects; used by round-trip tests and to seed
 * demo data. NaN samples are written as empty cells (as "NaN" in a single column, where an empty line would
 * vanish).
 */
export function formatTraceCsv(input: TraceCsvInput, options: FormatTraceCsvOptions = {}): string {
  const {
    layout = 'plain-columns',
    decimalComma = false,
    delimiter = decimalComma ? ';' : ',',
    lineEnding = '\n',
    significantDigits = 12,
    numberStyle = 'shortest',
    timeUnit = 's',
    valueUnit = 'V',
  } = options
  assertInput(input)
  if (decimalComma && delimiter === ',' && layout !== 'single-column') {
    throw new EngineError('invalid_option', 'Decimal commas need a semicolon or tab delimiter.')
  }
  const n = input.channels[0].values.length
  const start = input.startTime ?? (input.time && input.time.length > 0 ? input.time[0] : 0)
  const dt = input.sampleInterval
  const timeFactor = TIME_FACTORS[timeUnit]
  const number = (value: number): string => {
    if (!Number.isFinite(value)) return ''
    const printed = printNumber(value, significantDigits, numberStyle)
    return decimalComma ? printed.replace('.', ',') : printed
  }
  const timeAt = (i: number): number => (input.time ? input.time[i] : start + i * dt)
  const valueFactor = input.channels.map((channel) => (channel.unit === undefined || channel.unit === 'V' ? VALUE_FACTORS[valueUnit] : 1))
  const unitOf = (k: number): string => {
    const unit = input.channels[k].unit
    return unit === undefined || unit === 'V' ? valueUnit : unit
  }
  const valueAt = (k: number, i: number): string => number(input.channels[k].values[i] * valueFactor[k])
  const d = delimiter
  // Quote a text cell only when it would otherwise break the row.
  const text = (cell: string): string =>
    cell.includes(d) || /["\r\n]/.test(cell) ? `"${cell.replace(/"/g, '""')}"` : cell
  const lines: string[] = []
  const metadataLines = Object.entries(input.metadata ?? {}).map(([key, value]) => `${text(key)}${d}${text(value)}`)

  switch (layout) {
    case 'plain-columns':
    case 'headerless-columns':
    case 'preamble-header': {
      if (layout === 'preamble-header') lines.push(...metadataLines, `Sample interval${d}${number(dt)}${d}s`, '')
      if (layout !== 'headerless-columns') {
        lines.push([`Time (${timeUnit})`, ...input.channels.map((channel, k) => text(`${channel.name} (${unitOf(k)})`))].join(d))
      }
      for (let i = 0; i < n; i++) {
        const row = [number(timeAt(i) * timeFactor)]
        for (let k = 0; k < input.channels.length; k++) row.push(valueAt(k, i))
        lines.push(row.join(d))
      }
      break
    }
    case 'index-with-interval': {
      lines.push(...metadataLines)
      lines.push(`Sample interval${d}${number(dt * timeFactor)}${d}${timeUnit}`)
      lines.push(`Start time${d}${number(start * timeFactor)}${d}${timeUnit}`)
      lines.push('')
      lines.push(['Index', ...input.channels.map((channel, k) => text(`${channel.name} (${unitOf(k)})`))].join(d))
      for (let i = 0; i < n; i++) {
        const row = [String(i)]
        for (let k = 0; k < input.channels.length; k++) row.push(valueAt(k, i))
        lines.push(row.join(d))
      }
      break
    }
    case 'single-column': {
      if (input.channels.length !== 1) {
        throw new EngineError('invalid_option', 'The single-column layout holds exactly one channel.')
      }
      for (let i = 0; i < n; i++) lines.push(valueAt(0, i) || 'NaN')
      break
    }
    case 'side-by-side-blocks': {
      // Each channel: label, value, unit, time, sample, spacer; metadata rows on top of the label/value cells.
      const blockMeta = input.channels.map((channel, k) => [
        ['Record Length', String(n), 'Points'],
        ['Sample Interval', number(dt * timeFactor), timeUnit],
        ['Source', text(channel.name), ''],
        ['Vertical Units', unitOf(k), ''],
        ['Horizontal Units', timeUnit, ''],
        ...Object.entries(input.metadata ?? {}).map(([key, value]) => [text(key), text(value), '']),
      ])
      for (let i = 0; i < n; i++) {
        const cells: string[] = []
        for (let k = 0; k < input.channels.length; k++) {
          const meta = blockMeta[k][i] ?? ['', '', '']
          cells.push(...meta, number(timeAt(i) * timeFactor), valueAt(k, i), '')
        }
        lines.push(cells.join(d))
      }
      break
    }
    default:
      throw new EngineError('invalid_option', `Unknown layout "${String(layout)}".`)
  }
  return lines.join(lineEnding) + lineEnding
}

function printNumber(value: number, digits: number, style: FormatTraceCsvOptions['numberStyle']): string {
  if (style === 'exponent') return value.toExponential(digits - 1).toUpperCase()
  if (style === 'engineering') {
    if (value === 0) return '0.0'
    const exponent = Math.floor(Math.log10(Math.abs(value)) / 3) * 3
    const mantissa = value / 10 ** exponent
    const whole = Math.floor(Math.log10(Math.abs(mantissa))) + 1
    const printed = mantissa.toFixed(Math.max(0, digits - whole))
    return exponent === 0 ? printed : `${printed}E${exponent}`
  }
  return String(Number(value.toPrecision(digits)))
}

function assertInput(input: TraceCsvInput): void {
  if (!input || !Array.isArray(input.channels) || input.channels.length === 0) {
    throw new EngineError('invalid_input', 'A trace to write needs at least one channel.')
  }
  const n = input.channels[0].values.length
  if (input.channels.some((channel) => channel.values.length !== n)) {
    throw new EngineError('invalid_input', 'Every channel must hold the same number of samples.')
  }
  if (input.time && input.time.length !== n) {
    throw new EngineError('invalid_input', 'The time axis must hold one time per sample.')
  }
  if (!(input.sampleInterval > 0)) {
    throw new EngineError('invalid_input', 'The sample interval must be a positive number of seconds.')
  }
}

/** The headline of a result: the few numbers a person tuning a cavity looks at first, as CSV or one line of text. */
import type { AnalysisResult } from '../shared/analysis/types'
import type { FileOutcome } from './analyzeFile'

export const headlineColumns = [
  'file',
  'fundamentalFraction',
  'fundamentalFractionError',
  'misalignmentShare',
  'mismatchShare',
  'finesse',
  'linewidthHz',
  'fsrHz',
  'warnings',
  'error',
] as const

/** One CSV field: quoted when it holds a delimiter, a quote or a line break. */
function csvField(value: string | number | null | undefined): string {
  if (value === null || value === undefined) return ''
  const text = String(value)
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text
}

export function headlineCsvHeader(): string {
  return `${headlineColumns.join(',')}\n`
}

export function headlineCsvRow(outcome: FileOutcome): string {
  if ('error' in outcome) {
    return `${[csvField(outcome.file), '', '', '', '', '', '', '', '', csvField(`${outcome.error.code}: ${outcome.error.message}`)].join(',')}\n`
  }
  const r = outcome.result
  const fields = [
    outcome.file,
    r.fundamentalFraction,
    r.fundamentalFractionError,
    r.misalignmentShare,
    r.mismatchShare,
    r.finesse,
    r.linewidthHz,
    r.fsr.hz,
    r.warnings.map((w) => w.code).join(' '),
    null,
  ]
  return `${fields.map(csvField).join(',')}\n`
}

const percent = (x: number) => `${(100 * x).toFixed(1)} %`

/** "TEM00 93.2 % ± 0.4 %, misalignment 2.1 %, mismatch 4.0 %, finesse 1520, warnings: …" */
export function headlineText(result: AnalysisResult): string {
  const error = result.fundamentalFractionError === null ? '' : ` ± ${percent(result.fundamentalFractionError)}`
  const parts = [
    `TEM00 ${percent(result.fundamentalFraction)}${error}`,
    `misalignment ${percent(result.misalignmentShare)}`,
    `mismatch ${percent(result.mismatchShare)}`,
    `finesse ${result.finesse === null ? '—' : result.finesse.toFixed(0)}`,
  ]
  if (result.warnings.length > 0) parts.push(`warnings: ${result.warnings.map((w) => w.code).join(' ')}`)
  return parts.join(', ')
}

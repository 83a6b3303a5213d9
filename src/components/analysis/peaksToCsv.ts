import type { AnalysisPeak } from '../../../shared/analysis/types'

const COLUMNS = ['order', 'kind', 't_s', 'position_fsr', 'height_V', 'height_error_V', 'fwhm_s', 'area_Vs', 'share', 'fitted'] as const

/**
 * The peak table as CSV (RFC 4180: comma-separated, CRLF line ends, a header row), numbers in full
 * precision so a spreadsheet or script gets what the analysis stored; empty cells for missing values.
 */
export function peaksToCsv(peaks: readonly AnalysisPeak[]): string {
  const lines = [COLUMNS.join(',')]
  for (const peak of peaks) {
    const cells = [peak.order, peak.kind, peak.t, peak.positionFsr, peak.height, peak.heightError, peak.fwhmSeconds, peak.area, peak.share, peak.fitted]
    lines.push(cells.map(csvCell).join(','))
  }
  return `${lines.join('\r\n')}\r\n`
}

function csvCell(value: string | number | boolean | null): string {
  if (value === null || (typeof value === 'number' && !Number.isFinite(value))) return ''
  const text = String(value)
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text
}

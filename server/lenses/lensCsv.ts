/**
 * The lens kit as CSV: one header line with our column names (`lensCsvColumns`), one lens per line.
 * Reading checks every line and reports each problem with its line number; nothing is half-read.
 */
import Papa from 'papaparse'
import { lensCsvColumns, lensInputSchema, type Lens, type LensInput } from '../../shared/api/plannerSchemas'

/** A spreadsheet would run a cell starting with one of these as a formula; export prefixes it with ' and import drops it. */
const formulaStart = /^'(?=[=+\-@\t\r])/

export function formatLensCsv(lenses: readonly Lens[]): string {
  const rows = lenses.map((lens) => [lens.label, lens.focalLengthMm, lens.count, lens.type, lens.wavelengthMinNm, lens.wavelengthMaxNm, lens.notes])
  return `${Papa.unparse({ fields: [...lensCsvColumns], data: rows }, { escapeFormulae: true, newline: '\n' })}\n`
}

export type LensCsvReading = { lenses: { line: number; lens: LensInput }[] } | { errors: string[] }

/** Header names are matched loosely: case, spaces and punctuation do not matter ("Focal length mm" = focal_length_mm). */
const columnKey = (name: string) => name.trim().toLowerCase().replace(/[^a-z0-9]+/g, '_').replace(/^_|_$/g, '')

export function parseLensCsv(text: string): LensCsvReading {
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), { skipEmptyLines: false })
  const rows = parsed.data
  const headerIndex = rows.findIndex((row) => row.some((cell) => cell.trim() !== ''))
  if (headerIndex < 0) return { errors: ['The file is empty: expected a header line (label, focal_length_mm, …) and one lens per line.'] }
  const header = rows[headerIndex].map(columnKey)
  const unknown = header.filter((name) => name !== '' && !(lensCsvColumns as readonly string[]).includes(name))
  const missing = ['label', 'focal_length_mm'].filter((name) => !header.includes(name))
  if (missing.length > 0 || unknown.length > 0) {
    return {
      errors: [
        `line ${headerIndex + 1}: the header must name the columns ${lensCsvColumns.join(', ')}` +
          (missing.length ? `; missing: ${missing.join(', ')}` : '') +
          (unknown.length ? `; not known: ${unknown.join(', ')}` : ''),
      ],
    }
  }
  const errors: string[] = []
  const lenses: { line: number; lens: LensInput }[] = []
  const firstLineOfLabel = new Map<string, number>()
  for (let r = headerIndex + 1; r < rows.length; r++) {
    const line = r + 1
    const cells = rows[r]
    if (cells.every((cell) => cell.trim() === '')) continue
    if (cells.length > header.length) {
      errors.push(`line ${line}: ${cells.length} cells but the header names ${header.length} columns (quote text that holds a comma)`)
      continue
    }
    const cell = (name: string): string | undefined => {
      const index = header.indexOf(name)
      const value = index < 0 ? undefined : cells[index]?.trim()
      return value === undefined || value === '' ? undefined : value.replace(formulaStart, '')
    }
    const problems: string[] = []
    const number = (name: string): number | null | undefined => {
      const value = cell(name)
      if (value === undefined) return undefined
      const parsedNumber = Number(value)
      if (!Number.isFinite(parsedNumber)) {
        problems.push(`${name} "${value}" is not a number`)
        return undefined
      }
      return parsedNumber
    }
    const candidate = {
      label: cell('label') ?? '',
      focalLengthMm: number('focal_length_mm'),
      count: number('count') ?? 1,
      type: cell('type')?.toLowerCase() ?? 'plano-convex',
      wavelengthMinNm: number('wavelength_min_nm') ?? null,
      wavelengthMaxNm: number('wavelength_max_nm') ?? null,
      notes: cell('notes') ?? '',
    }
    if (candidate.focalLengthMm === undefined && problems.length === 0) problems.push('focal_length_mm is missing')
    if (problems.length === 0) {
      const checked = lensInputSchema.safeParse(candidate)
      if (checked.success) {
        const first = firstLineOfLabel.get(checked.data.label)
        if (first !== undefined) problems.push(`label "${checked.data.label}" appears again (first on line ${first}); labels must be unique`)
        else {
          firstLineOfLabel.set(checked.data.label, line)
          lenses.push({ line, lens: checked.data })
        }
      } else {
        problems.push(...checked.error.issues.map((issue) => issue.message))
      }
    }
    if (problems.length > 0) errors.push(`line ${line}: ${problems.join('; ')}`)
  }
  if (errors.length > 0) return { errors }
  if (lenses.length === 0) return { errors: ['The file has a header but no lenses: add one lens per line below it.'] }
  return { lenses }
}

import Papa from 'papaparse'
import { classifyCell } from './classifyCell'
import { createColumnSink, type ScannedColumns } from './createColumnSink'
import type { ScanNumericColumnsOptions } from './scanNumericColumns'

/**
 * The quote-aware twin of `scanNumericColumns`: the body is tokenised by papaparse (quoted cells, delimiters or
 * line breaks inside quotes), then the requested columns are classified cell by cell. Slower, same result shape.
 */
export function parseQuotedColumns(text: string, options: ScanNumericColumnsOptions): ScannedColumns {
  const { start = 0, delimiter = ',', decimalComma = false, columns } = options
  const sink = createColumnSink(columns.length)
  const { rowValues, rowKinds } = sink
  let line = -1
  Papa.parse<string[]>(text.slice(start), {
    delimiter,
    skipEmptyLines: true,
    step: (step) => {
      line++
      const cells = step.data
      columns.forEach((column, k) => {
        const cellText = cells[column]
        if (cellText === undefined) {
          rowKinds[k] = 0
          rowValues[k] = NaN
          return
        }
        const cell = classifyCell(cellText, decimalComma)
        rowKinds[k] = cell.kind
        rowValues[k] = cell.value
      })
      sink.commitRow(line)
    },
  })
  return sink.finish(true)
}

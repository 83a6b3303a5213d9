/** How a batch writes one file's outcome: a JSON line (`{"file", ...result}` or `{"file", "error"}`) or a CSV row. */
import type { FileOutcome } from './analyzeFile'
import { headlineCsvRow } from './headline'

export type OutputFormat = 'jsonl' | 'csv'

export function formatOutcome(outcome: FileOutcome, format: OutputFormat): string {
  if (format === 'csv') return headlineCsvRow(outcome)
  return 'error' in outcome ? `${JSON.stringify({ file: outcome.file, error: outcome.error })}\n` : `${JSON.stringify({ file: outcome.file, ...outcome.result })}\n`
}

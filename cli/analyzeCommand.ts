/**
 * `cavitrace analyze FILE... | DIR --cavity CAVITY.json [--sweep-direction up|down] [--csv] [--threads N]`.
 * One file: the analysis as one JSON object (the stable contract). Several files or a folder: one JSON line per
 * file in input order, analysed on worker threads. `--csv`: the headline fields, one row per file.
 */
import { availableParallelism } from 'node:os'
import type { AnalyzeOptions } from '../shared/analysis/types'
import { analyzeFile } from './analyzeFile'
import { headlineCsvHeader, headlineCsvRow } from './headline'
import { listTraceFiles } from './listTraceFiles'
import { parseCommandLine, positiveInteger } from './parseCommandLine'
import { readCavityFile } from './readInputs'
import { runBatch } from './runBatch'
import { UsageError } from './usageError'

export const analyzeHelp = `Usage: cavitrace analyze FILE... | DIR --cavity CAVITY.json [options]

One FILE: the full analysis as one JSON object. Several files or a folder (its .csv, .txt, .tsv
and .dat files, by name): one JSON line per file, in input order; a refused file gives
{"file", "error": {"code", "message"}} and the batch goes on.
  --cavity CAVITY.json         {"wavelengthNm", "lengthMm", "roc1Mm", "roc2Mm"} (null radius = flat)
  --sweep-direction up|down    which way the optical frequency runs, when known
  --csv                        headline fields only, as CSV with a header row
  --threads N                  worker threads for a batch (default: one per core)
Exit status: 0 all analysed, 1 a file refused, 2 usage error.
`

export async function analyzeCommand(args: string[]): Promise<number> {
  const parsed = parseCommandLine('analyze', args, {
    cavity: { type: 'string' },
    'sweep-direction': { type: 'string' },
    csv: { type: 'boolean' },
    threads: { type: 'string' },
  }, analyzeHelp)
  if (parsed === null) return 0
  const { values, positionals } = parsed
  if (positionals.length === 0) throw new UsageError('bad_argument', 'cavitrace analyze: name at least one FILE or DIR. (cavitrace analyze --help)')
  if (values.cavity === undefined) throw new UsageError('bad_argument', 'cavitrace analyze: --cavity CAVITY.json is required. (cavitrace analyze --help)')
  const direction = values['sweep-direction']
  if (direction !== undefined && direction !== 'up' && direction !== 'down') {
    throw new UsageError('bad_argument', `cavitrace analyze: --sweep-direction must be up or down, not ${JSON.stringify(direction)}.`)
  }
  const threads = positiveInteger('analyze', 'threads', values.threads) ?? availableParallelism()
  const cavity = readCavityFile(values.cavity)
  const options: AnalyzeOptions = direction ? { sweepDirection: direction } : {}
  const format = values.csv ? 'csv' : 'jsonl'
  const { files, fromFolder } = listTraceFiles(positionals)
  if (files.length === 0) throw new UsageError('no_files', `cavitrace analyze: ${positionals.map((p) => JSON.stringify(p)).join(', ')} holds no exports (.csv, .txt, .tsv, .dat).`)
  const write = (text: string) => process.stdout.write(text)
  if (format === 'csv') write(headlineCsvHeader())

  if (files.length === 1 && !fromFolder) {
    // One file: analysed on this thread, no worker to start.
    const outcome = analyzeFile(files[0], cavity, options)
    if (format === 'csv') write(headlineCsvRow(outcome))
    else write('error' in outcome ? `${JSON.stringify({ error: outcome.error })}\n` : `${JSON.stringify(outcome.result, null, 2)}\n`)
    return 'error' in outcome ? 1 : 0
  }
  const refused = await runBatch(files, { cavity, options, format, threads, write })
  return refused > 0 ? 1 : 0
}

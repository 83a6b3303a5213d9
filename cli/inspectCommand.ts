/** `cavitrace inspect FILE [--interval SECONDS]`: what the reader sees in one export, as JSON. */
import { readTrace } from '../shared/trace/readTrace'
import type { ReadTraceOptions } from '../shared/trace/types'
import { parseCommandLine } from './parseCommandLine'
import { readTraceBytes } from './readInputs'
import { UsageError } from './usageError'

export const inspectHelp = `Usage: cavitrace inspect FILE [--interval SECONDS]

Prints what the reader finds in one export as JSON: sample count, sample interval and start time
in seconds, channels with unit and detected role, metadata and warnings.
  --interval SECONDS   the sample interval, when the export's own is missing or wrong
`

export function inspectCommand(args: string[]): number {
  const parsed = parseCommandLine('inspect', args, { interval: { type: 'string' } }, inspectHelp)
  if (parsed === null) return 0
  const { values, positionals } = parsed
  if (positionals.length !== 1) throw new UsageError('bad_argument', `cavitrace inspect takes exactly one FILE (got ${positionals.length}). (cavitrace inspect --help)`)
  const options: ReadTraceOptions = {}
  if (values.interval !== undefined) {
    const seconds = Number(values.interval)
    if (values.interval.trim() === '' || !Number.isFinite(seconds) || seconds <= 0) {
      throw new UsageError('bad_argument', `cavitrace inspect: --interval needs a positive number of seconds, not ${JSON.stringify(values.interval)}.`)
    }
    options.sampleIntervalSeconds = seconds
  }
  const trace = readTrace(readTraceBytes(positionals[0]), options)
  const summary = {
    sampleCount: trace.sampleCount,
    sampleInterval: trace.sampleInterval,
    startTime: trace.startTime,
    channels: trace.channels.map(({ name, unit, role, roleEvidence }) => ({ name, unit, role, roleEvidence })),
    metadata: trace.metadata,
    warnings: trace.warnings,
  }
  process.stdout.write(`${JSON.stringify(summary, null, 2)}\n`)
  return 0
}

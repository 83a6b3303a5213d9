/**
 * `npm run --silent inspect -- FILE [--interval SECONDS]`: read one oscilloscope export and print what the reader
 * found as JSON (sample count, interval and start time in seconds, channels with unit and role, metadata,
 * warnings), or `{"error": {"code", "message"}}` with exit status 1.
 */
import { readFileSync, statSync } from 'node:fs'
import { EngineError, isEngineError } from '../shared/errors'
import { readTrace } from '../shared/trace/readTrace'
import type { ReadTraceOptions } from '../shared/trace/types'

const USAGE = 'Usage: npm run --silent inspect -- FILE [--interval SECONDS]'

function parseArguments(argv: string[]): { file: string; options: ReadTraceOptions } {
  const options: ReadTraceOptions = {}
  let file: string | undefined
  for (let i = 0; i < argv.length; i++) {
    const argument = argv[i]
    if (argument === '--interval' || argument.startsWith('--interval=')) {
      const text = argument.includes('=') ? argument.slice(argument.indexOf('=') + 1) : argv[++i]
      const seconds = Number(text)
      if (text === undefined || text.trim() === '' || !Number.isFinite(seconds) || seconds <= 0) {
        throw new EngineError('bad_argument', `--interval needs a positive number of seconds, not "${text ?? ''}". ${USAGE}`)
      }
      options.sampleIntervalSeconds = seconds
    } else if (argument.startsWith('-') && argument !== '-') {
      throw new EngineError('bad_argument', `Unknown option "${argument}". ${USAGE}`)
    } else if (file === undefined) {
      file = argument
    } else {
      throw new EngineError('bad_argument', `Only one file can be inspected at a time ("${file}", "${argument}"). ${USAGE}`)
    }
  }
  if (file === undefined) throw new EngineError('bad_argument', `No file given. ${USAGE}`)
  return { file, options }
}

/** The reader's own size limit, checked before loading so a huge file is never read into memory. */
const MAX_BYTES = 200 * 1024 * 1024

function readBytes(file: string): Uint8Array {
  try {
    const stats = statSync(file)
    if (!stats.isFile()) throw new EngineError('file_not_found', `"${file}" is not a file.`)
    if (stats.size > MAX_BYTES) {
      throw new EngineError('file_too_large', `The file is ${(stats.size / 2 ** 20).toFixed(1)} MiB, more than the limit of 200.0 MiB.`)
    }
    return readFileSync(file)
  } catch (error) {
    if (isEngineError(error)) throw error
    throw new EngineError('file_not_found', `Cannot read "${file}": no such file or no permission.`)
  }
}

function main(): void {
  try {
    const { file, options } = parseArguments(process.argv.slice(2))
    const trace = readTrace(readBytes(file), options)
    const summary = {
      sampleCount: trace.sampleCount,
      sampleInterval: trace.sampleInterval,
      startTime: trace.startTime,
      channels: trace.channels.map(({ name, unit, role, roleEvidence }) => ({ name, unit, role, roleEvidence })),
      metadata: trace.metadata,
      warnings: trace.warnings,
    }
    process.stdout.write(`${JSON.stringify(summary, null, 2)}\n`)
  } catch (error) {
    const { code, message } = isEngineError(error)
      ? error
      : { code: 'internal_error', message: 'The reader failed unexpectedly; please report this file.' }
    process.stdout.write(`${JSON.stringify({ error: { code, message } })}\n`)
    process.exitCode = 1
  }
}

main()

/**
 * `npm run --silent analyze -- TRACE_FILE --cavity CAVITY.json` — prints one JSON object, the AnalysisResult.
 * On bad input it prints `{"error": {"code", "message"}}` and exits with status 1.
 */
import { readFileSync } from 'node:fs'
import { analyzeTrace } from '../shared/analysis/analyzeTrace'
import { cavityGeometrySchema } from '../shared/cavity'
import { EngineError, isEngineError } from '../shared/errors'
import { readTrace } from '../shared/trace/readTrace'

function parseArguments(argv: string[]): { tracePath: string; cavityPath: string } {
  let tracePath: string | undefined
  let cavityPath: string | undefined
  for (let i = 0; i < argv.length; i++) {
    if (argv[i] === '--cavity') cavityPath = argv[++i]
    else if (argv[i].startsWith('--cavity=')) cavityPath = argv[i].slice('--cavity='.length)
    else if (!tracePath) tracePath = argv[i]
    else throw new EngineError('usage', `Unexpected argument ${JSON.stringify(argv[i])}. Usage: analyze TRACE_FILE --cavity CAVITY.json`)
  }
  if (!tracePath || !cavityPath) throw new EngineError('usage', 'Usage: analyze TRACE_FILE --cavity CAVITY.json')
  return { tracePath, cavityPath }
}

function readBytes(path: string, what: string): Buffer {
  try {
    return readFileSync(path)
  } catch (error) {
    const reason = (error as NodeJS.ErrnoException).code === 'ENOENT' ? 'does not exist' : 'cannot be read'
    throw new EngineError('file_not_found', `The ${what} file ${JSON.stringify(path)} ${reason}`)
  }
}

function readCavity(path: string) {
  let raw: unknown
  try {
    raw = JSON.parse(readBytes(path, 'cavity').toString('utf8'))
  } catch (error) {
    if (isEngineError(error)) throw error
    throw new EngineError('invalid_json', `The cavity file ${JSON.stringify(path)} is not valid JSON: ${(error as Error).message}`)
  }
  const parsed = cavityGeometrySchema.safeParse(raw)
  if (!parsed.success) {
    const issue = parsed.error.issues[0]
    const field = issue.path.join('.')
    throw new EngineError('invalid_geometry', `Invalid cavity geometry${field ? ` (${field})` : ''}: ${issue.message}`)
  }
  return parsed.data
}

function main(): number {
  try {
    const { tracePath, cavityPath } = parseArguments(process.argv.slice(2))
    const cavity = readCavity(cavityPath)
    const trace = readTrace(new Uint8Array(readBytes(tracePath, 'trace')))
    const result = analyzeTrace(trace, cavity)
    process.stdout.write(`${JSON.stringify(result, null, 2)}\n`)
    return 0
  } catch (error) {
    const code = isEngineError(error) ? error.code : 'internal_error'
    const message = error instanceof Error ? error.message : String(error)
    process.stdout.write(`${JSON.stringify({ error: { code, message } })}\n`)
    return 1
  }
}

process.exitCode = main()

/**
 * `npm run --silent analyze -- TRACE_FILE --cavity CAVITY.json [--sweep-direction up|down]` — prints one JSON
 * object, the AnalysisResult. `--sweep-direction` says which way the optical frequency runs during the sweep, when
 * the lab knows it (it settles a reading the data leave mirrored).
 * On bad input it prints `{"error": {"code", "message"}}` and exits with status 1.
 */
import { readFileSync } from 'node:fs'
import { analyzeTrace } from '../shared/analysis/analyzeTrace'
import { cavityGeometrySchema } from '../shared/cavity'
import { EngineError, isEngineError } from '../shared/errors'
import { readTrace } from '../shared/trace/readTrace'

const USAGE = 'Usage: analyze TRACE_FILE --cavity CAVITY.json [--sweep-direction up|down]'

function parseArguments(argv: string[]): { tracePath: string; cavityPath: string; sweepDirection?: 'up' | 'down' } {
  let tracePath: string | undefined
  let cavityPath: string | undefined
  let direction: string | undefined
  for (let i = 0; i < argv.length; i++) {
    if (argv[i] === '--cavity') cavityPath = argv[++i]
    else if (argv[i].startsWith('--cavity=')) cavityPath = argv[i].slice('--cavity='.length)
    else if (argv[i] === '--sweep-direction') direction = argv[++i]
    else if (argv[i].startsWith('--sweep-direction=')) direction = argv[i].slice('--sweep-direction='.length)
    else if (!tracePath) tracePath = argv[i]
    else throw new EngineError('usage', `Unexpected argument ${JSON.stringify(argv[i])}. ${USAGE}`)
  }
  if (!tracePath || !cavityPath) throw new EngineError('usage', USAGE)
  if (direction !== undefined && direction !== 'up' && direction !== 'down') {
    throw new EngineError('usage', `--sweep-direction must be up or down, got ${JSON.stringify(direction)}. ${USAGE}`)
  }
  return { tracePath, cavityPath, sweepDirection: direction }
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
    const { tracePath, cavityPath, sweepDirection } = parseArguments(process.argv.slice(2))
    const cavity = readCavity(cavityPath)
    const trace = readTrace(new Uint8Array(readBytes(tracePath, 'trace')))
    const result = analyzeTrace(trace, cavity, sweepDirection ? { sweepDirection } : {})
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

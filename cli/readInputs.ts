/** Reading the files a command names: the trace bytes and the cavity geometry. */
import { readFileSync, statSync } from 'node:fs'
import { cavityGeometrySchema, type CavityGeometry } from '../shared/cavity/geometrySchema'
import { EngineError } from '../shared/errors'
import { UsageError } from './usageError'

/** The reader's own size limit, checked before loading so a huge file is never read into memory. */
export const MAX_TRACE_BYTES = 200 * 1024 * 1024

/** The bytes of one export; a file that is missing, not a file or too large is refused as an analysis input. */
export function readTraceBytes(path: string): Uint8Array {
  let size: number
  try {
    const stats = statSync(path)
    if (!stats.isFile()) throw new EngineError('file_not_found', `${JSON.stringify(path)} is not a file.`)
    size = stats.size
  } catch (error) {
    if (error instanceof EngineError) throw error
    throw new EngineError('file_not_found', `Cannot read ${JSON.stringify(path)}: no such file or no permission.`)
  }
  if (size > MAX_TRACE_BYTES) {
    throw new EngineError('file_too_large', `The file is ${(size / 2 ** 20).toFixed(1)} MiB, more than the limit of ${MAX_TRACE_BYTES / 2 ** 20} MiB.`)
  }
  return readFileSync(path)
}

/** The cavity file named by --cavity: any fault in it is a usage error (the command cannot start). */
export function readCavityFile(path: string): CavityGeometry {
  let text: string
  try {
    text = readFileSync(path, 'utf8')
  } catch (error) {
    const reason = (error as NodeJS.ErrnoException).code === 'ENOENT' ? 'does not exist' : 'cannot be read'
    throw new UsageError('file_not_found', `The cavity file ${JSON.stringify(path)} ${reason}.`)
  }
  let raw: unknown
  try {
    raw = JSON.parse(text)
  } catch (error) {
    throw new UsageError('invalid_json', `The cavity file ${JSON.stringify(path)} is not valid JSON: ${(error as Error).message}`)
  }
  const parsed = cavityGeometrySchema.safeParse(raw)
  if (!parsed.success) {
    const issue = parsed.error.issues[0]
    const field = issue.path.join('.')
    throw new UsageError('invalid_geometry', `Invalid cavity geometry${field ? ` (${field})` : ''}: ${issue.message}`)
  }
  return parsed.data
}

/**
 * One uploaded file, streamed: never held whole in memory. A gzip-compressed export is decompressed on the way
 * in; the content is hashed (SHA-256, so the same export twice is found), checked to be text, and written
 * gzip-compressed to a temporary file that only this process's user may read. Refusals are HttpErrors: 415 for
 * a file that is not text, 422 for an empty one, 413 for a decompressed size over the limit.
 */
import { createHash } from 'node:crypto'
import { createWriteStream } from 'node:fs'
import { Transform, type Readable } from 'node:stream'
import { pipeline } from 'node:stream/promises'
import { createGunzip, createGzip } from 'node:zlib'
import { HttpError } from '../http/errors'
import { looksLikeText } from './looksLikeText'

export interface IngestedUpload {
  /** SHA-256 (hex) of the content (after decompressing a gzip upload). */
  sha256: string
  /** Bytes of content (after decompressing). */
  sizeBytes: number
  /** Whether the upload itself was gzip-compressed. */
  wasGzip: boolean
}

/** First chunk of a stream, put back so the stream still starts with it; null for an empty stream. */
function peek(stream: Readable): Promise<Buffer | null> {
  return new Promise((resolve, reject) => {
    const done = (chunk: Buffer | null) => {
      stream.off('readable', onReadable)
      stream.off('end', onEnd)
      stream.off('error', reject)
      resolve(chunk)
    }
    const onReadable = () => {
      const chunk = stream.read() as Buffer | null
      if (chunk === null) return // the 'end' that follows settles it
      stream.unshift(chunk)
      done(chunk)
    }
    const onEnd = () => done(null)
    stream.on('readable', onReadable)
    stream.once('end', onEnd)
    stream.once('error', reject)
  })
}

const HEAD_BYTES = 64 * 1024

/**
 * Stream `source` (one file of a multipart upload) to `gzipPath`, compressed. `name` is the file's name for
 * messages; `maxContentBytes` caps the decompressed content (a gzip upload can expand far beyond its size);
 * `countRaw` is told of every raw byte as it arrives and may throw to stop the upload (a cap per request).
 */
export async function ingestUpload(
  source: Readable,
  gzipPath: string,
  name: string,
  options: { maxContentBytes: number; countRaw?: (bytes: number) => void },
): Promise<IngestedUpload> {
  const { maxContentBytes, countRaw = () => {} } = options
  const first = await peek(source)
  const wasGzip = first !== null && first.length >= 2 && first[0] === 0x1f && first[1] === 0x8b
  const hash = createHash('sha256')
  let sizeBytes = 0
  let head = Buffer.alloc(0)
  const count = new Transform({
    transform(chunk: Buffer, _encoding, callback) {
      try {
        countRaw(chunk.length)
        callback(null, chunk)
      } catch (error) {
        callback(error as Error)
      }
    },
  })
  const inspect = new Transform({
    transform(chunk: Buffer, _encoding, callback) {
      sizeBytes += chunk.length
      if (sizeBytes > maxContentBytes) {
        return callback(new HttpError(413, 'file_too_large', `"${name}" holds more than the upload limit of ${(maxContentBytes / 1048576).toFixed(0)} MB once decompressed.`))
      }
      if (head.length < HEAD_BYTES) head = Buffer.concat([head, chunk.subarray(0, HEAD_BYTES - head.length)])
      hash.update(chunk)
      callback(null, chunk)
    },
  })
  const stages = wasGzip ? [source, count, createGunzip(), inspect] : [source, count, inspect]
  try {
    await pipeline([...stages, createGzip({ level: 6 }), createWriteStream(gzipPath, { mode: 0o600 })])
  } catch (error) {
    if (error instanceof HttpError) throw error
    if (wasGzip && (error as { code?: string }).code?.startsWith('Z_')) {
      throw new HttpError(415, 'bad_gzip', `"${name}" starts like a gzip file but does not decompress (${(error as Error).message}); send the export itself or a complete .gz of it.`)
    }
    throw error
  }
  const inside = wasGzip ? ' (after decompressing)' : ''
  if (head.toString('latin1').trim() === '') throw new HttpError(422, 'empty_file', `"${name}" is empty${inside}: there is nothing to analyse. Check that the export was saved before uploading.`)
  if (!looksLikeText(head)) {
    throw new HttpError(415, 'not_text', `"${name}" is not a text export${inside}: it holds binary bytes. Upload the scope's CSV/TSV export, or that export gzip-compressed (.gz).`)
  }
  return { sha256: hash.digest('hex'), sizeBytes, wasGzip }
}

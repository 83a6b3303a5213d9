/**
 * A trace's stored (gzip) bytes in 1 MiB rows of `trace_content_chunks`, written from a file a piece at a time so an
 * upload is never held whole in memory; read back joined (the analysis needs the whole file anyway).
 */
import { createReadStream } from 'node:fs'
import type { Db } from '../db/knex'

const CHUNK_BYTES = 1024 * 1024

/** Store the file at `gzipPath` as the content of trace `traceId` (inside the caller's transaction). */
export async function writeContentChunks(db: Db, traceId: string, gzipPath: string): Promise<void> {
  let seq = 0
  for await (const chunk of createReadStream(gzipPath, { highWaterMark: CHUNK_BYTES })) {
    await db('trace_content_chunks').insert({ trace_id: traceId, seq, bytes: chunk as Buffer })
    seq += 1
  }
}

/** The chunks of a trace joined, or null when it has none. */
export async function readContentChunks(db: Db, traceId: string): Promise<Buffer | null> {
  const rows = (await db('trace_content_chunks').where({ trace_id: traceId }).orderBy('seq').select('bytes')) as Array<{ bytes: Buffer }>
  return rows.length > 0 ? Buffer.concat(rows.map((row) => row.bytes)) : null
}

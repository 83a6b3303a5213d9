/**
 * Multipart upload of one or several files in the field `file`, streamed: each file goes through `ingestUpload`
 * (gzip uploads decompressed, hashed, checked to be text) into a compressed temporary file, so no whole file is
 * held in memory. A request whose Content-Length is over the total limit is refused before its body is read; a
 * request that grows past it while streaming is refused then. Nothing is stored when any file is refused.
 * multer's own errors become house-style answers (413 for size, 400 for the rest, 400 for a cut-off body).
 */
import { randomBytes } from 'node:crypto'
import { mkdirSync } from 'node:fs'
import { rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { Request, RequestHandler } from 'express'
import multer from 'multer'
import { HttpError } from '../http/errors'
import { ingestUpload, type IngestedUpload } from './ingestUpload'
import type { UploadedFile } from './traceService'

const MAX_FILES = 20
const MB = 1024 * 1024
/** Room for the multipart framing and the text fields around the files. */
const FRAMING_BYTES = 64 * 1024

export interface UploadLimits {
  /** Largest file (after decompressing a gzip upload), MB. */
  fileMb: number
  /** Largest request (all files together), MB. */
  totalMb: number
}

/** Temporary folder for uploads in flight, readable by this process's user only. */
function uploadFolder(): string {
  const folder = join(tmpdir(), `cavitrace-uploads-${process.getuid?.() ?? 'user'}`)
  mkdirSync(folder, { recursive: true, mode: 0o700 })
  return folder
}

type IngestedFile = Express.Multer.File & IngestedUpload

/** multer storage that streams each file through `ingestUpload`, counting the request's total as it goes. */
function ingestStorage(limits: UploadLimits): multer.StorageEngine {
  const totals = new WeakMap<Request, number>()
  return {
    _handleFile(req, file, callback) {
      const path = join(uploadFolder(), randomBytes(12).toString('hex'))
      const countRaw = (bytes: number) => {
        const counted = (totals.get(req) ?? 0) + bytes
        totals.set(req, counted)
        if (counted > limits.totalMb * MB) throw new HttpError(413, 'upload_too_large', `The files of one upload may hold at most ${limits.totalMb} MB together; send them in several uploads.`)
      }
      ingestUpload(file.stream, path, file.originalname, { maxContentBytes: limits.fileMb * MB, countRaw }).then(
        (ingested) => callback(null, { ...ingested, path, size: ingested.sizeBytes }),
        (error: unknown) => rm(path, { force: true }).finally(() => callback(error as Error)),
      )
    },
    _removeFile(_req, file, callback) {
      rm(file.path, { force: true }).then(() => callback(null), callback)
    },
  }
}

const truncated = /Unexpected end of form|Malformed part header|Unexpected end of file|Request aborted|Request closed/

export function receiveTraceFiles(limits: UploadLimits): RequestHandler {
  const upload = multer({
    storage: ingestStorage(limits),
    // Browsers send UTF-8 file names without saying so (RFC 7578 §4.2); multer's default would read them as Latin-1.
    defParamCharset: 'utf8',
    limits: { fileSize: Math.round(limits.fileMb * MB), files: MAX_FILES, fields: 10, fieldSize: 64 * 1024 },
  }).array('file', MAX_FILES)
  return (req, res, next) => {
    const declared = Number(req.headers['content-length'])
    if (Number.isFinite(declared) && declared > limits.totalMb * MB + FRAMING_BYTES) {
      res.set('Connection', 'close')
      return next(new HttpError(413, 'upload_too_large', `The upload declares ${(declared / MB).toFixed(0)} MB; one upload may hold at most ${limits.totalMb} MB (each file at most ${limits.fileMb} MB).`))
    }
    // Temporary files go when the answer is sent (or the client is gone), whatever happened.
    res.on('close', () => {
      for (const file of (req.files as IngestedFile[] | undefined) ?? []) if (file.path) void rm(file.path, { force: true })
    })
    upload(req, res, (error: unknown) => {
      if (!error) return next()
      if (error instanceof HttpError) return next(error)
      if (!(error instanceof multer.MulterError)) {
        if (error instanceof Error && truncated.test(error.message)) return next(new HttpError(400, 'truncated_upload', 'The upload ended before its last part was complete; send it again.'))
        return next(error)
      }
      if (error.code === 'LIMIT_FILE_SIZE') return next(new HttpError(413, 'file_too_large', `The file is larger than the upload limit of ${limits.fileMb} MB.`))
      if (error.code === 'LIMIT_UNEXPECTED_FILE') return next(new HttpError(400, 'unexpected_field', `Send files in the multipart field "file" (got "${error.field}").`))
      next(new HttpError(400, 'bad_upload', `The upload was refused: ${error.message} (send files in the multipart field "file").`))
    })
  }
}

/** The files `receiveTraceFiles` took in, as the upload use case wants them (".gz" dropped from decompressed names). */
export function uploadedFiles(req: Request): UploadedFile[] {
  return ((req.files as IngestedFile[] | undefined) ?? []).map((file) => {
    const name = file.originalname || 'trace.csv'
    return { fileName: file.wasGzip ? name.replace(/\.gz$/i, '') || 'trace.csv' : name, sha256: file.sha256, sizeBytes: file.sizeBytes, gzipPath: file.path }
  })
}

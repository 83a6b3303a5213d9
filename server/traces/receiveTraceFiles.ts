/**
 * Multipart upload of one or several files in the field `file`, held in memory up to the configured
 * limit; multer's own errors become house-style answers (413 for size, 400 for the rest).
 */
import type { Request, RequestHandler } from 'express'
import multer from 'multer'
import { HttpError } from '../http/errors'
import type { UploadedFile } from './traceService'

const MAX_FILES = 20

export function receiveTraceFiles(uploadLimitMb: number): RequestHandler {
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: Math.round(uploadLimitMb * 1024 * 1024), files: MAX_FILES, fields: 10 } }).array('file', MAX_FILES)
  return (req, res, next) => {
    upload(req, res, (error: unknown) => {
      if (!error) return next()
      if (!(error instanceof multer.MulterError)) return next(error)
      if (error.code === 'LIMIT_FILE_SIZE') return next(new HttpError(413, 'file_too_large', `The file is larger than the upload limit of ${uploadLimitMb} MB.`))
      if (error.code === 'LIMIT_UNEXPECTED_FILE') return next(new HttpError(400, 'unexpected_field', `Send files in the multipart field "file" (got "${error.field}").`))
      next(new HttpError(400, 'bad_upload', `The upload was refused: ${error.message} (send files in the multipart field "file").`))
    })
  }
}

/** The files `receiveTraceFiles` took in, as the upload use case wants them. */
export function uploadedFiles(req: Request): UploadedFile[] {
  return ((req.files as Express.Multer.File[] | undefined) ?? []).map((file) => ({ fileName: file.originalname || 'trace.csv', bytes: file.buffer }))
}

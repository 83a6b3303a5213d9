/**
 * Refuse a NUL byte anywhere in the query string or a JSON body with 400, naming where: PostgreSQL cannot store
 * it in text, and no export, name or note needs it. (Multipart text fields are checked by the error handler's
 * backstop: PostgreSQL's refusal becomes the same 400.)
 */
import type { RequestHandler } from 'express'
import { HttpError } from './errors'

/** Path of the first string holding U+0000 inside `value`, or null. */
export function findNulByte(value: unknown, path = ''): string | null {
  if (typeof value === 'string') return value.includes('\u0000') ? path || 'value' : null
  if (Array.isArray(value)) {
    for (const [k, item] of value.entries()) {
      const found = findNulByte(item, `${path}[${k}]`)
      if (found) return found
    }
    return null
  }
  if (value && typeof value === 'object') {
    for (const [key, item] of Object.entries(value)) {
      if (key.includes('\u0000')) return `${path}${path ? '.' : ''}${key.split('\u0000').join('\\0')}`
      const found = findNulByte(item, `${path}${path ? '.' : ''}${key}`)
      if (found) return found
    }
  }
  return null
}

export const refuseNulBytes: RequestHandler = (req, _res, next) => {
  const inBody = findNulByte(req.body)
  const where = /%00/.test(req.url) ? 'the address (path or query)' : inBody ? `field ${inBody}` : null
  if (where) return next(new HttpError(400, 'nul_byte', `The request holds a NUL byte (\\0) in ${where}; remove it and send again.`))
  next()
}

/**
 * One error class for everything the API refuses on purpose, and the one handler that turns any
 * error into `{ "error": { "code", "message" } }`.
 */
import type { ErrorRequestHandler, RequestHandler } from 'express'
import type { Logger } from 'pino'
import { ZodError } from 'zod'
import { isEngineError } from '../../shared/errors'

export class HttpError extends Error {
  constructor(
    /** HTTP status to answer with. */
    readonly status: number,
    /** Stable machine-readable code, e.g. `not_found`. */
    readonly code: string,
    message: string,
  ) {
    super(message)
    this.name = 'HttpError'
  }
}

/** Body of every error answer. */
export interface ErrorBody {
  error: { code: string; message: string; details?: unknown }
}

/** Describe a zod failure in one sentence naming the fields. */
export function describeZodError(error: ZodError): string {
  return error.issues.map((issue) => `${issue.path.length > 0 ? issue.path.join('.') : 'input'}: ${issue.message}`).join('; ')
}

/** Connection-level failures (PostgreSQL stopped, restarting, unreachable): the request may simply be tried again. */
const unreachableCodes = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EHOSTUNREACH', 'ENOTFOUND', 'EPIPE', '57P01', '57P02', '57P03', '08000', '08001', '08003', '08006'])

export function isDatabaseUnavailable(error: unknown): boolean {
  const { code, message, name } = (error ?? {}) as { code?: string; message?: string; name?: string }
  if (code && unreachableCodes.has(code)) return true
  if (name === 'KnexTimeoutError') return true
  // "timeout expired": pg's connect timeout, seen while PostgreSQL stops or starts (found by databaseOutage.test.ts).
  return typeof message === 'string' && /Connection terminated|Timeout acquiring a connection|connect ECONNREFUSED|timeout expired|not queryable|the database system is (starting up|shutting down)/.test(message)
}

/** PostgreSQL refused a character (a NUL byte, or bytes that are not UTF-8) in the input. */
function isBadCharacter(error: unknown): boolean {
  const code = (error as { code?: string } | null)?.code
  return code === '22021' || code === '22P05'
}

function toBody(error: unknown): { status: number; body: ErrorBody } {
  if (error instanceof HttpError) return { status: error.status, body: { error: { code: error.code, message: error.message } } }
  if (error instanceof ZodError) return { status: 400, body: { error: { code: 'invalid_input', message: describeZodError(error) } } }
  if (isEngineError(error)) return { status: 422, body: { error: { code: error.code, message: error.message } } }
  const status = (error as { status?: number; statusCode?: number }).status ?? (error as { statusCode?: number }).statusCode
  if (typeof status === 'number' && status >= 400 && status < 500) {
    // Errors raised by Express's own parsers (malformed JSON, payload too large).
    const type = (error as { type?: string }).type
    const code = type === 'entity.too.large' ? 'payload_too_large' : type === 'entity.parse.failed' ? 'malformed_json' : 'bad_request'
    return { status, body: { error: { code, message: (error as Error).message } } }
  }
  if (isDatabaseUnavailable(error)) {
    return { status: 503, body: { error: { code: 'database_unavailable', message: 'The database is not reachable right now (restarting or stopped); nothing was changed. Try again in a minute.' } } }
  }
  if (isBadCharacter(error)) return { status: 400, body: { error: { code: 'bad_character', message: 'The request holds a character the database cannot store (a NUL byte, or bytes that are not UTF-8); remove it and send again.' } } }
  return { status: 500, body: { error: { code: 'internal', message: 'Something went wrong on the server; the details are in its log.' } } }
}

/** The single error handler: typed errors become their status; anything else is logged and becomes 500. */
export function errorHandler(logger: Logger): ErrorRequestHandler {
  return (error, _req, res, _next) => {
    const { status, body } = toBody(error)
    if (status === 503) {
      res.set('Retry-After', '30')
      logger.warn({ err: error }, 'database unavailable')
    } else if (status >= 500) logger.error({ err: error }, 'request failed')
    res.status(status).json(body)
  }
}

/** 404 for API paths nobody answered. */
export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(new HttpError(404, 'not_found', `No API route for ${req.method} ${req.originalUrl}`))
}

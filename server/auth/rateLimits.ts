/**
 * Rate limits on the doors an attacker would knock on: sign-in (failed attempts only) and password
 * reset requests, per client address per 15 minutes, answered in the house error shape.
 */
import type { RequestHandler } from 'express'
import { rateLimit } from 'express-rate-limit'
import { HttpError } from '../http/errors'

const windowMs = 15 * 60 * 1000

function limiter(limit: number, what: string, skipSuccessfulRequests: boolean): RequestHandler {
  return rateLimit({
    windowMs,
    limit,
    skipSuccessfulRequests,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (req, _res, next) => {
      const resetTime = (req as { rateLimit?: { resetTime?: Date } }).rateLimit?.resetTime
      const minutes = resetTime ? Math.max(1, Math.ceil((resetTime.getTime() - Date.now()) / 60_000)) : 15
      next(new HttpError(429, 'too_many_attempts', `Too many ${what} from this address. Wait ${minutes} minute${minutes === 1 ? '' : 's'} and try again.`))
    },
  })
}

/** Counts only failed sign-ins, so a lab sharing one address is not locked out by its own successes. */
export const signInLimiter = (limit: number) => limiter(limit, 'failed sign-in attempts', true)
export const resetRequestLimiter = (limit: number) => limiter(limit, 'password reset requests', false)

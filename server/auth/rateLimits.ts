/**
 * Rate limits on the doors an attacker would knock on: sign-in (failed attempts only) and password
 * reset requests, per client address and per account (the e-mail address asked about, known or not) per
 * 15 minutes, answered in the house error shape. The client address is the connection's own unless
 * TRUST_PROXY names the proxy in front (see server/app.ts): otherwise anyone could rotate X-Forwarded-For.
 */
import type { Request, RequestHandler } from 'express'
import { rateLimit } from 'express-rate-limit'
import { HttpError } from '../http/errors'
import { actorOf } from './actor'

const windowMs = 15 * 60 * 1000

/** The account a request is about: the e-mail address it names, or the signed-in person's; trimmed, lower-cased. */
function accountKey(req: Request): string {
  const named = (req.body as { email?: unknown } | undefined)?.email
  const email = typeof named === 'string' ? named : (actorOf(req)?.email ?? '')
  return `account:${email.trim().toLowerCase()}`
}

function limiter(limit: number, what: string, skipSuccessfulRequests: boolean, perAccount = false): RequestHandler {
  return rateLimit({
    windowMs,
    limit,
    skipSuccessfulRequests,
    ...(perAccount ? { keyGenerator: accountKey } : {}),
    // A forged X-Forwarded-For without TRUST_PROXY is expected (and ignored): no console warning for it.
    validate: { xForwardedForHeader: false },
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (req, _res, next) => {
      const resetTime = (req as { rateLimit?: { resetTime?: Date } }).rateLimit?.resetTime
      const minutes = resetTime ? Math.max(1, Math.ceil((resetTime.getTime() - Date.now()) / 60_000)) : 15
      next(new HttpError(429, 'too_many_attempts', `Too many ${what}. Wait ${minutes} minute${minutes === 1 ? '' : 's'} and try again.`))
    },
  })
}

/** Counts only failed sign-ins, so a lab sharing one address is not locked out by its own successes. */
export const signInLimiter = (limit: number) => limiter(limit, 'failed sign-in attempts from this address', true)
export const resetRequestLimiter = (limit: number) => limiter(limit, 'password reset requests from this address', false)
/** Failed sign-ins for one account from anywhere (a guesser who rotates addresses). */
export const accountSignInLimiter = (limit: number) => limiter(limit, 'failed sign-in attempts for this account', true, true)
/** Reset requests for one address from anywhere, so nobody's mailbox can be flooded. */
export const accountResetLimiter = (limit: number) => limiter(limit, 'password reset requests for this account', false, true)

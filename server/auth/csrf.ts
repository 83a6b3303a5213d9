/**
 * Cross-site request forgery protection for writes, in three layers:
 * 1. the session cookie is SameSite=Lax, so browsers do not send it on cross-site POST/PATCH/DELETE;
 * 2. an unsafe request whose `Sec-Fetch-Site` header says `cross-site` or `same-site` is refused;
 * 3. an unsafe request whose `Origin` (or, lacking it, `Referer`) is not this app's origin is refused,
 *    and a cookie-carrying unsafe request with neither header is refused too.
 * Requests with `Authorization: Bearer` carry no ambient credential and are exempt. This is the
 * "verify origin with standard headers" and "fetch metadata" defence of the OWASP CSRF Prevention
 * Cheat Sheet; it needs nothing from the client beyond what browsers always send.
 */
import type { Request, RequestHandler } from 'express'
import type { AppConfig } from '../config'
import { HttpError } from '../http/errors'
import { sessionCookieName } from './sessionCookie'

const safeMethods = new Set(['GET', 'HEAD', 'OPTIONS'])

function originOf(url: string | undefined): string | null {
  if (!url) return null
  try {
    return new URL(url).origin
  } catch {
    return 'invalid'
  }
}

/**
 * This app's origin: APP_URL when it is set (the Host header is the client's to choose, so it is not believed then);
 * without APP_URL, the origin the request was addressed to (a development or single-machine install).
 */
function allowedOrigins(req: Request, config: AppConfig): Set<string> {
  if (config.APP_URL) return new Set([new URL(config.APP_URL).origin])
  return new Set([`${req.protocol}://${req.get('host') ?? ''}`])
}

export function csrfProtection(config: AppConfig): RequestHandler {
  return (req, _res, next) => {
    if (safeMethods.has(req.method) || req.get('authorization')) return next()
    const refuse = (why: string) => next(new HttpError(403, 'csrf_refused', `This request was refused as a possible cross-site request forgery (${why}). Reload the page and try again.`))
    const fetchSite = req.get('sec-fetch-site')
    if (fetchSite && fetchSite !== 'same-origin' && fetchSite !== 'none') return refuse(`it came from a ${fetchSite} page`)
    const origin = originOf(req.get('origin')) ?? originOf(req.get('referer'))
    if (origin) {
      if (!allowedOrigins(req, config).has(origin)) return refuse(`its origin ${origin} is not this app`)
      return next()
    }
    const hasCookie = Boolean((req.cookies as Record<string, string> | undefined)?.[sessionCookieName])
    if (hasCookie) return refuse('it did not say where it came from')
    next()
  }
}

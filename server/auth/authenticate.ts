/**
 * Find out who is asking: an `Authorization: Bearer <API token>` header, or else the session cookie.
 * A bad Bearer token is refused outright (401); a bad or stale cookie just leaves the request
 * anonymous. Disabled people are never authenticated, by either route.
 */
import type { RequestHandler } from 'express'
import type { Db } from '../db/knex'
import { HttpError } from '../http/errors'
import { hashSecret } from '../tokens/secretTokens'
import { useTokenByHash } from '../tokens/tokensData'
import { findUserById } from '../users/usersData'
import { setActor } from './actor'
import { sessionCookieName, verifySessionToken } from './sessionCookie'

export function bearerTokenOf(header: string | undefined): string | null {
  const match = /^Bearer\s+(\S+)\s*$/i.exec(header ?? '')
  return match ? match[1] : null
}

export function authenticate(db: Db, sessionSecret: () => Promise<string>): RequestHandler {
  return async (req, _res, next) => {
    try {
      const bearer = bearerTokenOf(req.get('authorization'))
      if (req.get('authorization') !== undefined) {
        // Built only when needed: an Error captures a stack trace, too dear to pay on every request.
        const refused = () => new HttpError(401, 'invalid_token', 'The API token is not valid: it may have been revoked or have expired, or its owner disabled.')
        if (!bearer) throw new HttpError(401, 'invalid_token', 'Send the API token as "Authorization: Bearer <token>".')
        const found = await useTokenByHash(db, hashSecret(bearer))
        const user = found?.owner
        if (!found || !user || user.disabledAt) throw refused()
        setActor(req, { id: user.id, email: user.email, name: user.name, role: user.role, via: 'token', tokenId: found.tokenId })
        return next()
      }
      const cookie = (req.cookies as Record<string, string> | undefined)?.[sessionCookieName]
      if (cookie) {
        const claims = verifySessionToken(cookie, await sessionSecret())
        const user = claims ? await findUserById(db, claims.userId) : null
        if (user && claims && !user.disabledAt && user.sessionVersion === claims.sessionVersion) {
          setActor(req, { id: user.id, email: user.email, name: user.name, role: user.role, via: 'session' })
        }
      }
      next()
    } catch (error) {
      next(error)
    }
  }
}

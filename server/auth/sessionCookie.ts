/**
 * The session: a signed JWT (HS256) in an httpOnly, SameSite=Lax cookie. It lasts SESSION_HOURS from
 * sign-in (not sliding) and carries the user's id and session version, so sign-out, a password reset
 * or disabling the account ends it server-side even before it expires.
 */
import type { Request, Response } from 'express'
import jwt from 'jsonwebtoken'
import type { AppConfig } from '../config'

export const sessionCookieName = 'ct_session'
const issuer = 'cavitrace'
const audience = 'cavitrace-session'

export interface SessionClaims {
  /** User id. */
  userId: number
  /** The user's session version when the cookie was issued. */
  sessionVersion: number
}

function cookieOptions(config: AppConfig, req: Request) {
  return {
    httpOnly: true,
    sameSite: 'lax' as const,
    // Secure whenever the app is reached over https (directly or through a loopback proxy).
    secure: req.secure || (config.APP_URL ?? '').startsWith('https:'),
    path: '/',
  }
}

export function issueSessionCookie(res: Response, req: Request, config: AppConfig, secret: string, claims: SessionClaims): void {
  const token = jwt.sign({ sv: claims.sessionVersion }, secret, {
    algorithm: 'HS256',
    subject: String(claims.userId),
    issuer,
    audience,
    expiresIn: Math.round(config.SESSION_HOURS * 3600),
  })
  res.cookie(sessionCookieName, token, { ...cookieOptions(config, req), maxAge: Math.round(config.SESSION_HOURS * 3600 * 1000) })
}

export function clearSessionCookie(res: Response, req: Request, config: AppConfig): void {
  res.clearCookie(sessionCookieName, cookieOptions(config, req))
}

/** The claims of a valid, unexpired cookie value; null for anything else. */
export function verifySessionToken(token: string, secret: string): SessionClaims | null {
  try {
    const payload = jwt.verify(token, secret, { algorithms: ['HS256'], issuer, audience })
    if (typeof payload !== 'object' || payload === null) return null
    const userId = Number(payload.sub)
    const sessionVersion = Number((payload as { sv?: unknown }).sv)
    if (!Number.isInteger(userId) || !Number.isInteger(sessionVersion)) return null
    return { userId, sessionVersion }
  } catch {
    return null
  }
}

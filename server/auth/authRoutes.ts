/** `/api/auth/*`: sign in and out, who am I, and password reset. Thin: parse, call the domain, answer. */
import { Router } from 'express'
import { changePasswordInputSchema, loginInputSchema, resetInputSchema, resetRequestInputSchema, type SessionAnswer } from '../../shared/auth/schemas'
import { recordAudit } from '../audit/auditData'
import { updateUser } from '../users/usersData'
import type { AccountsContext } from './accountsContext'
import { actorOf, requireActor, toSessionUser } from './actor'
import { changePassword, requestPasswordReset, resetPassword, signIn } from './authDomain'
import { HttpError } from '../http/errors'
import { requireSignedIn } from './requirePermission'
import { accountResetLimiter, accountSignInLimiter, resetRequestLimiter, signInLimiter } from './rateLimits'
import { clearSessionCookie, issueSessionCookie } from './sessionCookie'

export function authRoutes(context: AccountsContext): Router {
  const { config, db } = context
  const router = Router()

  router.post('/auth/login', signInLimiter(config.AUTH_RATE_LIMIT), accountSignInLimiter(config.AUTH_ACCOUNT_RATE_LIMIT), async (req, res) => {
    const input = loginInputSchema.parse(req.body)
    const user = await signIn(context, input, req.ip ?? null)
    issueSessionCookie(res, req, config, await context.sessionSecret(), { userId: user.id, sessionVersion: user.sessionVersion })
    const answer: SessionAnswer = { user: toSessionUser({ id: user.id, email: user.email, name: user.name, role: user.role, via: 'session' }) }
    res.json(answer)
  })

  // Signing out ends every session of this person (the session version moves on), not only this browser's.
  router.post('/auth/logout', async (req, res) => {
    const actor = actorOf(req)
    if (actor?.via === 'session') {
      await updateUser(db, actor.id, { endSessions: true })
      await recordAudit(db, { event: 'auth.sign_out', actor, subject: actor.email, ip: req.ip ?? null })
    }
    clearSessionCookie(res, req, config)
    res.status(204).end()
  })

  router.get('/auth/me', requireSignedIn, (req, res) => {
    const answer: SessionAnswer = { user: toSessionUser(requireActor(req)) }
    res.json(answer)
  })

  router.post('/auth/reset-request', resetRequestLimiter(config.AUTH_RATE_LIMIT), accountResetLimiter(config.AUTH_ACCOUNT_RESET_LIMIT), async (req, res) => {
    const input = resetRequestInputSchema.parse(req.body)
    await requestPasswordReset(context, input, req.ip ?? null)
    res.status(202).json({ message: 'If an account exists for that address, a link to reset its password is on its way. It works once, for one hour.' })
  })

  // Change one's own password from a signed-in session (not with an API token); other sessions end, this one goes on.
  router.post('/auth/password', requireSignedIn, accountSignInLimiter(config.AUTH_ACCOUNT_RATE_LIMIT), async (req, res) => {
    const actor = requireActor(req)
    if (actor.via !== 'session') throw new HttpError(403, 'session_required', 'Change your password from a signed-in session, not with an API token.')
    const input = changePasswordInputSchema.parse(req.body)
    const user = await changePassword(context, actor.id, input, req.ip ?? null)
    issueSessionCookie(res, req, config, await context.sessionSecret(), { userId: user.id, sessionVersion: user.sessionVersion })
    res.json({ message: 'Your password has been changed. Other browsers where you were signed in are signed out.' })
  })

  router.post('/auth/reset', async (req, res) => {
    const input = resetInputSchema.parse(req.body)
    await resetPassword(context, input, req.ip ?? null)
    res.json({ message: 'Your password has been changed. Sign in with the new one.' })
  })

  return router
}

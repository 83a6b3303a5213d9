/** `GET|POST /api/invitations` (admins) and `POST /api/invitations/accept` (anyone holding a link). */
import { Router } from 'express'
import { acceptInvitationInputSchema, invitationInputSchema, type SessionAnswer } from '../../shared/auth/schemas'
import type { AccountsContext } from '../auth/accountsContext'
import { requireActor, toSessionUser } from '../auth/actor'
import { requirePermission } from '../auth/requirePermission'
import { issueSessionCookie } from '../auth/sessionCookie'
import { recordSignIn } from '../users/usersData'
import { listInvitations } from './invitationsData'
import { acceptInvitation, invitePerson } from './invitationsDomain'

export function invitationsRoutes(context: AccountsContext): Router {
  const { config, db } = context
  const router = Router()
  router.get('/invitations', requirePermission('users.manage'), async (_req, res) => {
    res.json({ invitations: await listInvitations(db) })
  })
  router.post('/invitations', requirePermission('users.manage'), async (req, res) => {
    const input = invitationInputSchema.parse(req.body)
    res.status(201).json({ invitation: await invitePerson(context, requireActor(req), input, req.ip ?? null) })
  })
  // Accepting signs the new person in straight away: they have just proved they hold the link and chose a password.
  router.post('/invitations/accept', async (req, res) => {
    const input = acceptInvitationInputSchema.parse(req.body)
    const user = await acceptInvitation(context, input, req.ip ?? null)
    await recordSignIn(db, user.id)
    issueSessionCookie(res, req, config, await context.sessionSecret(), { userId: user.id, sessionVersion: user.sessionVersion })
    const answer: SessionAnswer = { user: toSessionUser({ id: user.id, email: user.email, name: user.name, role: user.role, via: 'session' }) }
    res.status(201).json(answer)
  })
  return router
}

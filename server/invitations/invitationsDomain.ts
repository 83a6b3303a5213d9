/** Invite a person by e-mail with a role; accept the invitation once, within 72 hours. */
import { passwordProblem } from '../../shared/auth/passwordPolicy'
import type { AcceptInvitationInput, InvitationInput, InvitationSummary } from '../../shared/auth/schemas'
import { recordAudit } from '../audit/auditData'
import type { AccountsContext } from '../auth/accountsContext'
import type { Actor } from '../auth/actor'
import { hashPassword } from '../auth/passwords'
import { HttpError } from '../http/errors'
import { invitationMail } from '../mail/accountMessages'
import { hashSecret, newLinkToken } from '../tokens/secretTokens'
import { findUserByEmail, insertUser, type UserRecord } from '../users/usersData'
import { findInvitationForUpdate, insertInvitation, markInvitationAccepted } from './invitationsData'

/** Invitation links expire this long after they are sent. */
export const invitationLifetimeMs = 72 * 60 * 60 * 1000

export async function invitePerson(context: AccountsContext, actor: Actor, input: InvitationInput, ip: string | null): Promise<InvitationSummary> {
  const { db, mailer } = context
  if (await findUserByEmail(db, input.email)) throw new HttpError(409, 'already_member', `${input.email} already has an account.`)
  const { secret, hash } = newLinkToken()
  const expiresAt = new Date(Date.now() + invitationLifetimeMs)
  const invitation = await db.transaction(async (trx) => {
    const created = await insertInvitation(trx, { email: input.email, role: input.role, hash, invitedBy: actor.id, expiresAt })
    await recordAudit(trx, { event: 'invitation.created', actor, subject: input.email, ip, details: { role: input.role, invitationId: created.id } })
    return created
  })
  // Sent after the commit, in the background: the admin sees the invitation at once either way.
  mailer.sendLater(invitationMail({ to: input.email, role: input.role, invitedBy: actor.name, baseUrl: context.publicUrl(), token: secret, expiresAt }))
  return { ...invitation, invitedBy: actor.email }
}

/** Create the account an invitation stands for. Refuses unknown, used, replaced and expired links with a message saying which. */
export async function acceptInvitation(context: AccountsContext, input: AcceptInvitationInput, ip: string | null): Promise<UserRecord> {
  const { db } = context
  return db.transaction(async (trx) => {
    const invitation = await findInvitationForUpdate(trx, hashSecret(input.token))
    if (!invitation) throw new HttpError(400, 'invitation_invalid', 'This invitation link is not valid. Check that the whole link was copied, or ask an administrator for a new invitation.')
    if (invitation.acceptedAt) throw new HttpError(410, 'invitation_used', 'This invitation has already been used. Sign in with the account it created, or ask an administrator for a new invitation.')
    if (invitation.replacedAt) throw new HttpError(410, 'invitation_replaced', 'A newer invitation was sent to this address; use the link in the latest e-mail.')
    if (invitation.expiresAt.getTime() <= Date.now()) throw new HttpError(410, 'invitation_expired', 'This invitation has expired (invitations last 72 hours). Ask an administrator to invite you again.')
    const problem = passwordProblem(input.password, { email: invitation.email, name: input.name })
    if (problem) throw new HttpError(400, 'weak_password', problem)
    if (await findUserByEmail(trx, invitation.email)) throw new HttpError(409, 'already_member', `${invitation.email} already has an account; sign in instead.`)
    const user = await insertUser(trx, { email: invitation.email, name: input.name, role: invitation.role, passwordHash: await hashPassword(input.password) })
    await markInvitationAccepted(trx, invitation.id, user.id)
    await recordAudit(trx, { event: 'invitation.accepted', actor: { id: user.id, email: user.email }, subject: user.email, ip, details: { role: user.role, invitationId: invitation.id } })
    return user
  })
}

/** API tokens for lab scripts and instruments: create (secret shown once), list, revoke. */
import { can } from '../../shared/auth/permissions'
import type { CreatedToken, TokenInput, TokenSummary } from '../../shared/auth/schemas'
import { recordAudit } from '../audit/auditData'
import type { Actor } from '../auth/actor'
import type { Db } from '../db/knex'
import { HttpError } from '../http/errors'
import { newApiToken } from './secretTokens'
import { findUserById } from '../users/usersData'
import { findToken, insertToken, listTokens, revokeToken, revokeTokensOfUser } from './tokensData'

export async function createToken(db: Db, actor: Actor, input: TokenInput, ip: string | null): Promise<CreatedToken> {
  const { secret, prefix, hash } = newApiToken()
  const token = await insertToken(db, { userId: actor.id, name: input.name, prefix, hash, expiresAt: input.expiresAt ? new Date(input.expiresAt) : undefined })
  await recordAudit(db, { event: 'token.created', actor, subject: actor.email, ip, details: { tokenId: token.id, name: input.name, prefix, expiresAt: token.summary.expiresAt } })
  return { token: token.summary, secret }
}

/** One's own tokens; with `all` (admins only), everyone's. */
export async function listTokensFor(db: Db, actor: Actor, all: boolean): Promise<TokenSummary[]> {
  if (all && !can(actor.role, 'tokens.manageAll')) throw new HttpError(403, 'forbidden', 'Only admins may list everyone’s tokens.')
  return (await listTokens(db, all ? undefined : actor.id)).map((token) => token.summary)
}

/** Revoke every live token of one person (admins). */
export async function revokeAllTokensOf(db: Db, actor: Actor, userId: number, ip: string | null): Promise<{ revoked: number }> {
  const owner = await findUserById(db, userId)
  if (!owner) throw new HttpError(404, 'user_not_found', `There is no person with id ${userId}.`)
  const revoked = await revokeTokensOfUser(db, userId)
  await recordAudit(db, { event: 'token.revoked_all', actor, subject: owner.email, ip, details: { ownerId: userId, revoked } })
  return { revoked }
}

/** Revoke one's own token, or anyone's as an admin. Someone else's token looks absent to non-admins. */
export async function revokeTokenFor(db: Db, actor: Actor, id: number, ip: string | null): Promise<TokenSummary> {
  const token = await findToken(db, id)
  if (!token || (token.userId !== actor.id && !can(actor.role, 'tokens.manageAll'))) throw new HttpError(404, 'token_not_found', `There is no token with id ${id} among yours.`)
  if (await revokeToken(db, id)) {
    await recordAudit(db, { event: 'token.revoked', actor, subject: token.summary.name, ip, details: { tokenId: id, ownerId: token.userId, prefix: token.summary.prefix } })
  }
  return (await findToken(db, id))?.summary ?? token.summary
}

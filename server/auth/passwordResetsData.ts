/** Data access for password reset links (`password_resets`): single-use, stored as hashes. */
import type { Db } from '../db/knex'
import { HttpError } from '../http/errors'
import { findUserById, type UserRecord } from '../users/usersData'

export async function insertPasswordReset(db: Db, reset: { userId: number; hash: string; expiresAt: Date }): Promise<void> {
  await db('password_resets').insert({ user_id: reset.userId, token_hash: reset.hash, expires_at: reset.expiresAt })
}

/**
 * Use up the reset link with this hash (inside the caller's transaction) and return its person.
 * `check` may refuse before anything is used up (e.g. a weak new password), so the link still works.
 * Refuses unknown, used and expired links with a message saying which.
 */
export async function consumePasswordReset(trx: Db, hash: string, check: (user: UserRecord) => Promise<void>): Promise<UserRecord> {
  const row = (await trx('password_resets').where({ token_hash: hash }).forUpdate().first()) as
    | { id: number; user_id: number; expires_at: Date; used_at: Date | null }
    | undefined
  if (!row) throw new HttpError(400, 'reset_link_invalid', 'This password reset link is not valid. Ask for a new one from the sign-in page.')
  if (row.used_at) throw new HttpError(410, 'reset_link_used', 'This password reset link has already been used. Ask for a new one from the sign-in page.')
  if (row.expires_at.getTime() <= Date.now()) throw new HttpError(410, 'reset_link_expired', 'This password reset link has expired (links last one hour). Ask for a new one from the sign-in page.')
  const user = await findUserById(trx, row.user_id)
  if (!user || user.disabledAt) throw new HttpError(400, 'reset_link_invalid', 'This password reset link is not valid. Ask for a new one from the sign-in page.')
  await check(user)
  // One reset ends them all: every other outstanding link of this person is used up too.
  await trx('password_resets').where({ user_id: row.user_id }).whereNull('used_at').update({ used_at: trx.fn.now() })
  return user
}

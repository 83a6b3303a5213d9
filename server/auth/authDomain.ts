/** Sign-in and password reset, free of HTTP: the routes pass plain inputs and get plain results. */
import { passwordProblem } from '../../shared/auth/passwordPolicy'
import type { ChangePasswordInput, LoginInput, ResetInput, ResetRequestInput } from '../../shared/auth/schemas'
import { recordAudit } from '../audit/auditData'
import { HttpError } from '../http/errors'
import { passwordResetMail } from '../mail/accountMessages'
import { hashSecret, newLinkToken } from '../tokens/secretTokens'
import { findUserByEmail, findUserById, recordSignIn, updateUser, type UserRecord } from '../users/usersData'
import type { AccountsContext } from './accountsContext'
import { hashPassword, verifyPassword } from './passwords'
import { consumePasswordReset, insertPasswordReset } from './passwordResetsData'

/** Reset links expire this long after they are sent. */
export const resetLinkLifetimeMs = 60 * 60 * 1000

/** Check e-mail and password; the signed-in user, or a 401 that does not say which of the two was wrong. */
export async function signIn(context: AccountsContext, input: LoginInput, ip: string | null): Promise<UserRecord> {
  const { db } = context
  const user = await findUserByEmail(db, input.email)
  const matches = await verifyPassword(user?.passwordHash, input.password)
  if (!user || !matches || user.disabledAt) {
    const reason = !user ? 'unknown_email' : !matches ? 'wrong_password' : 'disabled'
    await recordAudit(db, { event: 'auth.sign_in_failed', subject: input.email, ip, details: { reason }, actor: user ? { id: user.id, email: user.email } : null })
    // A disabled account answers exactly like a wrong password: a different answer would confirm the password.
    throw new HttpError(401, 'wrong_credentials', 'That e-mail address and password do not match an account.')
  }
  await recordSignIn(db, user.id)
  await recordAudit(db, { event: 'auth.sign_in', actor: { id: user.id, email: user.email }, subject: user.email, ip })
  return user
}

/** Send a reset link when the address belongs to an active account; say nothing either way. */
export async function requestPasswordReset(context: AccountsContext, input: ResetRequestInput, ip: string | null): Promise<void> {
  const { db, mailer } = context
  const user = await findUserByEmail(db, input.email)
  await recordAudit(db, { event: 'auth.reset_requested', subject: input.email, ip, details: { known: Boolean(user && !user.disabledAt) } })
  if (!user || user.disabledAt) return
  // The link is stored and mailed after the answer: a known address must not take longer to answer than an unknown one.
  setImmediate(() => {
    const { secret, hash } = newLinkToken()
    insertPasswordReset(db, { userId: user.id, hash, expiresAt: new Date(Date.now() + resetLinkLifetimeMs) }).then(
      () => mailer.sendLater(passwordResetMail({ to: user.email, name: user.name, baseUrl: context.publicUrl(), token: secret })),
      (error: unknown) => context.logger.error({ err: error }, 'could not store a password reset link'),
    )
  })
}

/**
 * A signed-in person changes their own password (the current one proves it is them). Every other session of
 * theirs ends; the caller issues this session a fresh cookie from the returned record.
 */
export async function changePassword(context: AccountsContext, userId: number, input: ChangePasswordInput, ip: string | null): Promise<UserRecord> {
  const { db } = context
  const user = await findUserById(db, userId)
  if (!user || user.disabledAt) throw new HttpError(401, 'not_signed_in', 'Sign in to continue.')
  if (!(await verifyPassword(user.passwordHash, input.currentPassword))) {
    await recordAudit(db, { event: 'auth.sign_in_failed', actor: { id: user.id, email: user.email }, subject: user.email, ip, details: { reason: 'wrong_current_password' } })
    throw new HttpError(403, 'wrong_password', 'The current password is not right; the password was not changed.')
  }
  const problem = passwordProblem(input.newPassword, { email: user.email, name: user.name })
  if (problem) throw new HttpError(400, 'weak_password', problem)
  const changed = await updateUser(db, user.id, { passwordHash: await hashPassword(input.newPassword), endSessions: true })
  await recordAudit(db, { event: 'auth.password_changed', actor: { id: user.id, email: user.email }, subject: user.email, ip })
  return changed ?? user
}

/** Set a new password from a reset link; every earlier session of that person ends. */
export async function resetPassword(context: AccountsContext, input: ResetInput, ip: string | null): Promise<void> {
  const { db } = context
  await db.transaction(async (trx) => {
    const user = await consumePasswordReset(trx, hashSecret(input.token), async (candidate) => {
      const problem = passwordProblem(input.password, { email: candidate.email, name: candidate.name })
      if (problem) throw new HttpError(400, 'weak_password', problem)
    })
    await updateUser(trx, user.id, { passwordHash: await hashPassword(input.password), endSessions: true })
    await recordAudit(trx, { event: 'auth.password_reset', actor: { id: user.id, email: user.email }, subject: user.email, ip })
  })
}

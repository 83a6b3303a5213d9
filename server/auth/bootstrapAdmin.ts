/**
 * The first admin, from CAVITRACE_ADMIN_EMAIL / CAVITRACE_ADMIN_PASSWORD, on a start when no active
 * admin exists. An existing account with that address is made admin (its password is left alone).
 */
import { passwordProblem } from '../../shared/auth/passwordPolicy'
import { recordAudit } from '../audit/auditData'
import type { Db } from '../db/knex'
import { countActiveAdmins, findUserByEmail, insertUser, updateUser } from '../users/usersData'
import { hashPassword } from './passwords'

export type BootstrapResult = 'created' | 'promoted' | 'admin_exists' | 'not_configured'

export async function bootstrapAdmin(db: Db, credentials: { email?: string; password?: string }): Promise<BootstrapResult> {
  const { email, password } = credentials
  if (!email || !password) return 'not_configured'
  const address = email.trim().toLowerCase()
  const problem = passwordProblem(password, { email: address })
  if (problem) throw new Error(`CAVITRACE_ADMIN_PASSWORD is refused by the password policy: ${problem}`)
  return db.transaction(async (trx) => {
    await trx.raw('select pg_advisory_xact_lock(7301)')
    if ((await countActiveAdmins(trx)) > 0) return 'admin_exists'
    const existing = await findUserByEmail(trx, address)
    const user = existing
      ? await updateUser(trx, existing.id, { role: 'admin', disabled: false })
      : await insertUser(trx, { email: address, name: 'Administrator', role: 'admin', passwordHash: await hashPassword(password) })
    if (user) await recordAudit(trx, { event: 'user.bootstrapped_admin', subject: user.email, details: { from: 'CAVITRACE_ADMIN_EMAIL', existing: Boolean(existing) } })
    return existing ? 'promoted' : 'created'
  })
}

/** Managing people: list, rename, change role, disable. Keeps at least one active admin. */
import type { UserPatchInput, UserSummary } from '../../shared/auth/schemas'
import { recordAudit, type AuditRecordInput } from '../audit/auditData'
import type { Actor } from '../auth/actor'
import type { Db } from '../db/knex'
import { HttpError } from '../http/errors'
import { countActiveAdmins, findUserById, listUsers, toUserSummary, updateUser } from './usersData'

export async function listPeople(db: Db): Promise<UserSummary[]> {
  return (await listUsers(db)).map(toUserSummary)
}

export async function changePerson(db: Db, actor: Actor, id: number, patch: UserPatchInput, ip: string | null): Promise<UserSummary> {
  return db.transaction(async (trx) => {
    // Serialise admin changes so two admins cannot demote each other at the same moment.
    await trx.raw('select pg_advisory_xact_lock(7301)')
    const before = await findUserById(trx, id)
    if (!before) throw new HttpError(404, 'user_not_found', `There is no person with id ${id}.`)
    const losesAdmin = before.role === 'admin' && !before.disabledAt && ((patch.role !== undefined && patch.role !== 'admin') || patch.disabled === true)
    if (losesAdmin && (await countActiveAdmins(trx, id)) === 0) {
      throw new HttpError(409, 'last_admin', 'This is the only active admin: make someone else an admin first.')
    }
    const disabling = patch.disabled === true && !before.disabledAt
    const after = await updateUser(trx, id, { role: patch.role, disabled: patch.disabled, name: patch.name, endSessions: disabling })
    if (!after) throw new HttpError(404, 'user_not_found', `There is no person with id ${id}.`)
    const events: AuditRecordInput[] = []
    const base = { actor, subject: after.email, ip }
    if (patch.role !== undefined && patch.role !== before.role) events.push({ ...base, event: 'user.role_changed', details: { from: before.role, to: patch.role } })
    if (disabling) events.push({ ...base, event: 'user.disabled' })
    if (patch.disabled === false && before.disabledAt) events.push({ ...base, event: 'user.enabled' })
    if (patch.name !== undefined && patch.name !== before.name) events.push({ ...base, event: 'user.renamed', details: { from: before.name, to: patch.name } })
    for (const event of events) await recordAudit(trx, event)
    return toUserSummary(after)
  })
}

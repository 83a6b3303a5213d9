/** Data access for invitations: single-use, stored as hashes of the e-mailed token. */
import type { Role } from '../../shared/auth/permissions'
import type { InvitationStatus, InvitationSummary } from '../../shared/auth/schemas'
import type { Db } from '../db/knex'

interface InvitationRow {
  id: number
  email: string
  role: Role
  invited_by_email: string | null
  expires_at: Date
  accepted_at: Date | null
  replaced_at: Date | null
  created_at: Date
}

export interface InvitationRecord {
  id: number
  email: string
  role: Role
  expiresAt: Date
  acceptedAt: Date | null
  replacedAt: Date | null
}

function statusOf(row: Pick<InvitationRow, 'accepted_at' | 'replaced_at' | 'expires_at'>, now = Date.now()): InvitationStatus {
  if (row.accepted_at) return 'accepted'
  if (row.replaced_at) return 'replaced'
  return row.expires_at.getTime() <= now ? 'expired' : 'pending'
}

export async function listInvitations(db: Db): Promise<InvitationSummary[]> {
  const rows = (await db('invitations')
    .leftJoin('users', 'users.id', 'invitations.invited_by')
    .select('invitations.*', 'users.email as invited_by_email')
    .orderBy('invitations.id', 'desc')) as InvitationRow[]
  return rows.map((row) => ({
    id: row.id,
    email: row.email,
    role: row.role,
    status: statusOf(row),
    invitedBy: row.invited_by_email,
    createdAt: row.created_at.toISOString(),
    expiresAt: row.expires_at.toISOString(),
    acceptedAt: row.accepted_at?.toISOString() ?? null,
  }))
}

/** Store a new invitation; any still-open invitation for the same address is marked replaced. */
export async function insertInvitation(db: Db, invitation: { email: string; role: Role; hash: string; invitedBy: number; expiresAt: Date }): Promise<InvitationSummary> {
  await db('invitations').where({ email: invitation.email }).whereNull('accepted_at').whereNull('replaced_at').update({ replaced_at: db.fn.now() })
  const [row] = (await db('invitations')
    .insert({ email: invitation.email, role: invitation.role, token_hash: invitation.hash, invited_by: invitation.invitedBy, expires_at: invitation.expiresAt })
    .returning('*')) as InvitationRow[]
  return {
    id: row.id,
    email: row.email,
    role: row.role,
    status: statusOf(row),
    invitedBy: null,
    createdAt: row.created_at.toISOString(),
    expiresAt: row.expires_at.toISOString(),
    acceptedAt: null,
  }
}

/** The invitation with this token hash, locked for the caller's transaction. */
export async function findInvitationForUpdate(trx: Db, hash: string): Promise<InvitationRecord | null> {
  const row = (await trx('invitations').where({ token_hash: hash }).forUpdate().first()) as (InvitationRow & { token_hash: string }) | undefined
  return row ? { id: row.id, email: row.email, role: row.role, expiresAt: row.expires_at, acceptedAt: row.accepted_at, replacedAt: row.replaced_at } : null
}

export async function markInvitationAccepted(trx: Db, id: number, userId: number): Promise<void> {
  await trx('invitations').where({ id }).update({ accepted_at: trx.fn.now(), user_id: userId })
}

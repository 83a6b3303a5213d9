/** Data access for the audit log of security events. */
import type { AuditEntry, AuditQuery } from '../../shared/auth/schemas'
import type { Db } from '../db/knex'

/** Security events written to the audit log. */
export type AuditEvent =
  | 'auth.sign_in'
  | 'auth.sign_in_failed'
  | 'auth.sign_out'
  | 'auth.reset_requested'
  | 'auth.password_reset'
  | 'auth.password_changed'
  | 'user.role_changed'
  | 'user.renamed'
  | 'user.disabled'
  | 'user.enabled'
  | 'user.bootstrapped_admin'
  | 'invitation.created'
  | 'invitation.accepted'
  | 'token.created'
  | 'token.revoked'
  | 'token.revoked_all'
  | 'trace.deleted'
  | 'trace.restored'
  | 'trace.moved'
  | 'analysis.excluded'
  | 'analysis.included'
  | 'cavity.proposed'
  | 'cavity.approved'
  | 'cavity.rejected'

export interface AuditRecordInput {
  event: AuditEvent
  actor?: { id: number; email: string } | null
  /** What the event was about, e.g. the address a sign-in was tried for. */
  subject?: string | null
  ip?: string | null
  details?: Record<string, unknown>
}

export async function recordAudit(db: Db, entry: AuditRecordInput): Promise<void> {
  await db('audit_events').insert({
    event: entry.event,
    actor_id: entry.actor?.id ?? null,
    actor_email: entry.actor?.email ?? null,
    subject: entry.subject ?? null,
    ip: entry.ip ?? null,
    details: JSON.stringify(entry.details ?? {}),
  })
}

interface AuditRow {
  id: string | number
  at: Date
  event: string
  actor_email: string | null
  subject: string | null
  ip: string | null
  details: Record<string, unknown>
}

/** Newest first; `before` pages back by id. */
export async function listAudit(db: Db, query: AuditQuery): Promise<AuditEntry[]> {
  const rows: AuditRow[] = await db<AuditRow>('audit_events')
    .modify((builder) => {
      if (query.before !== undefined) builder.where('id', '<', query.before)
      if (query.event) builder.where({ event: query.event })
    })
    .orderBy('id', 'desc')
    .limit(query.limit)
  return rows.map((row) => ({
    id: Number(row.id),
    at: row.at.toISOString(),
    event: row.event,
    actorEmail: row.actor_email,
    subject: row.subject,
    ip: row.ip,
    details: row.details ?? {},
  }))
}

/** Data access for in-app notifications and the state of the e-mail each may carry. */
import type { AppNotification, NotificationKind } from '../../shared/api/alertSchemas'
import type { Db } from '../db/knex'

interface NotificationRow {
  id: string | number
  user_id: number
  cavity_id: string | null
  analysis_id: string | null
  kind: NotificationKind
  title: string
  body: string
  details: Record<string, unknown>
  created_at: Date
  read_at: Date | null
}

function toNotification(row: NotificationRow): AppNotification {
  return {
    id: Number(row.id),
    kind: row.kind,
    title: row.title,
    body: row.body,
    cavityId: row.cavity_id,
    analysisId: row.analysis_id,
    details: row.details,
    createdAt: row.created_at.toISOString(),
    readAt: row.read_at?.toISOString() ?? null,
  }
}

export interface NewNotification {
  userId: number
  cavityId: string | null
  analysisId: string | null
  kind: NotificationKind
  title: string
  body: string
  details: Record<string, unknown>
  /** Also e-mail it (picked up by the alert mail dispatcher). */
  mail: boolean
}

export async function insertNotifications(db: Db, notifications: NewNotification[]): Promise<void> {
  if (notifications.length === 0) return
  await db('notifications').insert(
    notifications.map((item) => ({
      user_id: item.userId,
      cavity_id: item.cavityId,
      analysis_id: item.analysisId,
      kind: item.kind,
      title: item.title,
      body: item.body,
      details: JSON.stringify(item.details),
      mail_status: item.mail ? 'pending' : 'none',
    })),
  )
}

export async function listNotifications(db: Db, userId: number, options: { unread?: boolean; limit: number }): Promise<AppNotification[]> {
  const query = db<NotificationRow>('notifications').where({ user_id: userId }).orderBy('id', 'desc').limit(options.limit)
  if (options.unread) query.whereNull('read_at')
  return ((await query) as NotificationRow[]).map(toNotification)
}

export async function countUnread(db: Db, userId: number): Promise<number> {
  const [row] = (await db('notifications').where({ user_id: userId }).whereNull('read_at').count('* as count')) as Array<{ count: string }>
  return Number(row.count)
}

/** Mark one of the user's notifications read; null when it is not theirs (or does not exist). */
export async function markRead(db: Db, userId: number, id: number): Promise<AppNotification | null> {
  const [row] = (await db('notifications')
    .where({ id, user_id: userId })
    .update({ read_at: db.raw('coalesce(read_at, now())') })
    .returning('*')) as NotificationRow[]
  return row ? toNotification(row) : null
}

export async function markAllRead(db: Db, userId: number): Promise<number> {
  return db('notifications').where({ user_id: userId }).whereNull('read_at').update({ read_at: db.fn.now() })
}

export interface MailWaiting {
  id: number
  userId: number
  cavityId: string | null
  analysisId: string | null
  title: string
  body: string
  attempts: number
}

/**
 * Take up to `limit` notifications whose e-mail is waiting, so that no other app instance takes them
 * too (row locks skipped, status set to "sending"). Claims older than `staleMinutes` count as waiting:
 * their sender died.
 */
export async function claimWaitingMail(db: Db, options: { limit: number; staleMinutes: number }): Promise<MailWaiting[]> {
  const result = await db.raw<{ rows: Array<{ id: string; user_id: number; cavity_id: string | null; analysis_id: string | null; title: string; body: string; mail_attempts: number }> }>(
    `update notifications set mail_status = 'sending', mail_claimed_at = now(), mail_attempts = mail_attempts + 1
      where id in (
        select id from notifications
         where mail_status = 'pending' or (mail_status = 'sending' and mail_claimed_at < now() - make_interval(mins => ?))
         order by id limit ? for update skip locked)
      returning id, user_id, cavity_id, analysis_id, title, body, mail_attempts`,
    [options.staleMinutes, options.limit],
  )
  return result.rows
    .map((row) => ({ id: Number(row.id), userId: row.user_id, cavityId: row.cavity_id, analysisId: row.analysis_id, title: row.title, body: row.body, attempts: row.mail_attempts }))
    .sort((a, b) => a.id - b.id)
}

export async function finishMail(db: Db, ids: number[], outcome: 'sent' | 'pending' | 'failed'): Promise<void> {
  if (ids.length === 0) return
  await db('notifications')
    .whereIn('id', ids)
    .update({ mail_status: outcome, mailed_at: outcome === 'sent' ? db.fn.now() : null })
}

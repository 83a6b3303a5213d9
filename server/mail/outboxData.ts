/** Data access for mail caught by the local SMTP fake (`outbox_messages`). */
import type { OutboxMessage } from '../../shared/auth/schemas'
import type { Db } from '../db/knex'

export interface CapturedMessage {
  from: string
  to: string[]
  subject: string
  text: string
  raw: string
}

export async function insertOutboxMessage(db: Db, message: CapturedMessage): Promise<void> {
  await db('outbox_messages').insert({
    envelope_from: message.from,
    envelope_to: message.to,
    subject: message.subject,
    text_body: message.text,
    raw: message.raw,
  })
}

interface OutboxRow {
  id: number
  received_at: Date
  envelope_from: string
  envelope_to: string[]
  subject: string
  text_body: string
}

/** Newest first, optionally only mail to one address. */
export async function listOutbox(db: Db, options: { to?: string; limit?: number } = {}): Promise<OutboxMessage[]> {
  const { to, limit = 200 } = options
  const query = db<OutboxRow>('outbox_messages').orderBy('id', 'desc').limit(limit)
  if (to) query.whereRaw('? = any(envelope_to)', [to.toLowerCase()])
  const rows = await query
  return rows.map((row) => ({ id: row.id, receivedAt: row.received_at.toISOString(), from: row.envelope_from, to: row.envelope_to, subject: row.subject, text: row.text_body }))
}

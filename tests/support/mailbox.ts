/** Read mail caught by the test server's SMTP fake (kept in its database's outbox_messages). */
import type { OutboxMessage } from '../../shared/auth/schemas'
import type { Db } from '../../server/db/knex'
import { listOutbox } from '../../server/mail/outboxData'

/**
 * Wait for a message to `to` whose subject matches, newer than `afterId`. Mail is sent in the
 * background after the API answers, so it can arrive a moment later.
 */
export async function waitForMail(db: Db, to: string, options: { subject?: RegExp; afterId?: number; timeoutMs?: number } = {}): Promise<OutboxMessage> {
  const { subject, afterId = 0, timeoutMs = 10_000 } = options
  const deadline = Date.now() + timeoutMs
  for (;;) {
    const found = (await listOutbox(db, { to })).find((message) => message.id > afterId && (!subject || subject.test(message.subject)))
    if (found) return found
    if (Date.now() > deadline) throw new Error(`no e-mail to ${to}${subject ? ` with a subject matching ${subject}` : ''} within ${timeoutMs} ms`)
    await new Promise((resolve) => setTimeout(resolve, 50))
  }
}

/** The newest message id so far (0 when none), to wait only for mail sent after this point. */
export async function lastMailId(db: Db): Promise<number> {
  return (await listOutbox(db, { limit: 1 }))[0]?.id ?? 0
}

/** The link in a message that goes to `pagePath` (e.g. /reset-password), and the token after `#token=`. */
export function linkIn(message: OutboxMessage, pagePath: string): { url: string; token: string } {
  const match = new RegExp(`(https?://\\S+${pagePath.replace(/[/-]/g, '\\$&')}#token=([A-Za-z0-9_-]+))`).exec(message.text)
  if (!match) throw new Error(`no ${pagePath} link in the message "${message.subject}":\n${message.text}`)
  return { url: match[1], token: match[2] }
}

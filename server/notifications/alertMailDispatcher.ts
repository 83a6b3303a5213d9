/**
 * Sends the e-mail of alert notifications. The alert check may run in any process (app or stand-alone
 * worker), so it only marks notifications "pending"; every app instance polls for them here and sends
 * one message per person and analysis. Rows are claimed with skipped locks, so two instances never
 * send the same message; a failed send is retried a few times, then left as failed.
 */
import type { Logger } from 'pino'
import { alertMail } from '../alerts/alertMessages'
import type { Db } from '../db/knex'
import type { Mailer } from '../mail/mailer'
import { claimWaitingMail, finishMail, type MailWaiting } from './notificationRepository'

const MAX_ATTEMPTS = 3
const BATCH = 100

export interface AlertMailDispatcher {
  /** Send everything waiting now; resolves with the number of messages sent. */
  drain(): Promise<number>
  stop(): Promise<void>
}

export function startAlertMailDispatcher(context: { db: Db; mailer: Mailer; logger: Logger; baseUrl: () => string }, options: { intervalMs?: number } = {}): AlertMailDispatcher {
  const { db, mailer, logger } = context
  /** @default 2000 */
  const intervalMs = options.intervalMs ?? 2000
  let running: Promise<number> | null = null
  let stopped = false

  async function sendBatch(claimed: MailWaiting[]): Promise<number> {
    const groups = new Map<string, MailWaiting[]>()
    for (const item of claimed) {
      const key = `${item.userId}/${item.analysisId ?? item.id}`
      groups.set(key, [...(groups.get(key) ?? []), item])
    }
    const userIds = [...new Set(claimed.map((item) => item.userId))]
    const cavityIds = [...new Set(claimed.flatMap((item) => (item.cavityId ? [item.cavityId] : [])))]
    const users = new Map(
      ((await db('users').whereIn('id', userIds).select('id', 'email', 'name', 'disabled_at')) as Array<{ id: number; email: string; name: string; disabled_at: Date | null }>).map((row) => [row.id, row]),
    )
    const cavities = new Map(((await db('cavities').whereIn('id', cavityIds).select('id', 'name')) as Array<{ id: string; name: string }>).map((row) => [row.id, row.name]))
    let sent = 0
    for (const items of groups.values()) {
      const ids = items.map((item) => item.id)
      const user = users.get(items[0].userId)
      if (!user || user.disabled_at) {
        await finishMail(db, ids, 'failed')
        continue
      }
      const cavityId = items[0].cavityId
      try {
        await mailer.send(
          alertMail({ to: user.email, name: user.name, cavityName: (cavityId && cavities.get(cavityId)) || 'a cavity', cavityId, analysisId: items[0].analysisId, items, baseUrl: context.baseUrl() }),
        )
        await finishMail(db, ids, 'sent')
        sent += 1
      } catch (error) {
        const attempts = Math.max(...items.map((item) => item.attempts))
        logger.error({ err: error, notificationIds: ids, attempts }, 'alert e-mail could not be sent')
        await finishMail(db, ids, attempts >= MAX_ATTEMPTS ? 'failed' : 'pending')
      }
    }
    return sent
  }

  async function drainOnce(): Promise<number> {
    let sent = 0
    // Bounded: a batch whose sends fail goes back to pending and waits for the next tick.
    for (let round = 0; round < 10; round++) {
      const claimed = await claimWaitingMail(db, { limit: BATCH, staleMinutes: 10 })
      if (claimed.length === 0) break
      sent += await sendBatch(claimed)
      if (claimed.length < BATCH) break
    }
    return sent
  }

  const drain = (): Promise<number> => {
    // One drain at a time per process; a call during one waits for it and then runs again.
    const next: Promise<number> = (running ?? Promise.resolve(0)).catch(() => 0).then(() => drainOnce())
    running = next
    return next.finally(() => {
      if (running === next) running = null
    })
  }

  const timer = setInterval(() => {
    if (stopped || running) return
    drain().catch((error: unknown) => logger.warn({ err: error }, 'alert mail dispatch failed; retrying'))
  }, intervalMs)
  timer.unref()

  return {
    drain,
    async stop() {
      stopped = true
      clearInterval(timer)
      await running?.catch(() => undefined)
    },
  }
}

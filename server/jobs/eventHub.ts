/**
 * Analysis status events across app instances: published with PostgreSQL NOTIFY, heard with LISTEN
 * on one dedicated connection, fanned out to this instance's subscribers (the per-cavity event streams).
 */
import pg from 'pg'
import type { Logger } from 'pino'
import type { AnalysisEvent } from '../../shared/api/tuningTypes'
import type { Db } from '../db/knex'

const CHANNEL = 'cavitrace_events'

export type { AnalysisEvent }

export interface EventHub {
  publish(event: AnalysisEvent): Promise<void>
  /** Listen to one cavity's events; returns the unsubscribe function. */
  subscribe(cavityId: string, listener: (event: AnalysisEvent) => void): () => void
  close(): Promise<void>
}

export function createEventHub(options: { databaseUrl: string; db: Db; logger: Logger }): EventHub {
  const { databaseUrl, db, logger } = options
  const listeners = new Map<string, Set<(event: AnalysisEvent) => void>>()
  let client: pg.Client | null = null
  let closed = false
  let connecting: Promise<void> | null = null

  const deliver = (payload: string | undefined) => {
    if (!payload) return
    try {
      const event = JSON.parse(payload) as AnalysisEvent
      for (const listener of listeners.get(event.cavityId) ?? []) listener(event)
    } catch (error) {
      logger.warn({ err: error }, 'ignored a malformed event')
    }
  }

  // Connect only when someone listens, so instances without open streams hold no extra connection.
  const ensureListening = () => {
    if (client || connecting || closed) return
    const fresh = new pg.Client({ connectionString: databaseUrl })
    connecting = fresh
      .connect()
      .then(() => fresh.query(`LISTEN ${CHANNEL}`))
      .then(() => {
        client = fresh
        fresh.on('notification', (message) => deliver(message.payload))
        fresh.on('error', (error) => {
          logger.warn({ err: error }, 'event listener connection lost; reconnecting')
          client = null
          setTimeout(ensureListening, 1000).unref()
        })
      })
      .catch((error: unknown) => {
        logger.warn({ err: error }, 'could not listen for events; retrying')
        setTimeout(ensureListening, 2000).unref()
      })
      .finally(() => {
        connecting = null
      })
  }

  return {
    async publish(event) {
      await db.raw('select pg_notify(?, ?)', [CHANNEL, JSON.stringify(event)])
    },
    subscribe(cavityId, listener) {
      ensureListening()
      const set = listeners.get(cavityId) ?? new Set()
      set.add(listener)
      listeners.set(cavityId, set)
      return () => {
        set.delete(listener)
        if (set.size === 0) listeners.delete(cavityId)
      }
    },
    async close() {
      closed = true
      listeners.clear()
      await connecting
      await client?.end().catch(() => undefined)
      client = null
    },
  }
}

/**
 * The key that signs session cookies. Production takes SESSION_SECRET from the environment (the
 * config refuses to start without it). Development and tests make a random one once and keep it in
 * app_settings, so sessions survive a restart without anyone having to configure a secret.
 */
import { randomBytes } from 'node:crypto'
import type { Logger } from 'pino'
import type { AppConfig } from '../config'
import type { Db } from '../db/knex'

const settingKey = 'session_secret'

/** Returns a function that resolves the secret, reading (or creating) it at most once per process. */
export function sessionSecretSource(config: AppConfig, db: Db, logger: Logger): () => Promise<string> {
  if (config.SESSION_SECRET) {
    const secret = config.SESSION_SECRET
    return async () => secret
  }
  let pending: Promise<string> | undefined
  const load = async (): Promise<string> => {
    const fresh = randomBytes(32).toString('hex')
    // Insert-or-keep, so two processes starting together agree on one secret.
    await db('app_settings').insert({ key: settingKey, value: JSON.stringify(fresh) }).onConflict('key').ignore()
    const row = (await db('app_settings').where({ key: settingKey }).first()) as { value: unknown } | undefined
    if (typeof row?.value !== 'string') throw new Error('app_settings.session_secret is missing or not a string')
    logger.debug('session secret loaded from app_settings (development/test only)')
    return row.value
  }
  return () => {
    // A failed read (database down) is retried on the next request rather than cached.
    pending ??= load().catch((error: unknown) => {
      pending = undefined
      throw error
    })
    return pending
  }
}

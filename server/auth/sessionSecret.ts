/**
 * The key that signs session cookies. It never lives in the database (a dump, or anyone who can read
 * the database, must not be able to forge a session): it comes from SESSION_SECRET, or from the file
 * SESSION_SECRET_FILE names (readable by its owner only; `npm start` makes one in the data folder).
 * Without either (a development or test server started by hand) each process makes a random one, so
 * sessions end when it restarts.
 */
import { randomBytes } from 'node:crypto'
import { readFileSync, statSync } from 'node:fs'
import type { Logger } from 'pino'
import { ConfigError, type AppConfig } from '../config'

/** Read a secret file, refusing one that other users could read or one too short to be a key. */
export function readSecretFile(path: string): string {
  let mode: number
  try {
    mode = statSync(path).mode
  } catch {
    throw new ConfigError(`SESSION_SECRET_FILE names ${path}, which does not exist`)
  }
  if ((mode & 0o077) !== 0) throw new ConfigError(`SESSION_SECRET_FILE ${path} can be read by other users; run "chmod 600 ${path}"`)
  const secret = readFileSync(path, 'utf8').trim()
  if (secret.length < 32) throw new ConfigError(`SESSION_SECRET_FILE ${path} must hold at least 32 characters`)
  return secret
}

/** The key of servers started without one: one per process, so instances in one process agree. */
const processKey = randomBytes(32).toString('hex')

/** Returns a function that resolves the secret (read once, at start). */
export function sessionSecretSource(config: AppConfig, logger: Logger): () => Promise<string> {
  let secret: string
  if (config.SESSION_SECRET) secret = config.SESSION_SECRET
  else if (config.SESSION_SECRET_FILE) secret = readSecretFile(config.SESSION_SECRET_FILE)
  else {
    secret = processKey
    logger.warn('no SESSION_SECRET or SESSION_SECRET_FILE: sessions are signed with a key made for this process and end when it stops')
  }
  return async () => secret
}

/** What the accounts modules (auth, users, invitations, tokens, audit) need from the running app. */
import type { Logger } from 'pino'
import type { AppConfig } from '../config'
import type { Db } from '../db/knex'
import type { Mailer } from '../mail/mailer'

export interface AccountsContext {
  config: AppConfig
  db: Db
  logger: Logger
  mailer: Mailer
  /** The key that signs session cookies. */
  sessionSecret: () => Promise<string>
  /** Base URL for links in e-mail (APP_URL, or the address the server listens on) — never the request's Host header. */
  publicUrl: () => string
}

/**
 * The local SMTP fake for development and tests: an SMTP server on loopback, inside the app's own
 * process, that accepts every message and keeps it in `outbox_messages`. No TLS and no
 * authentication: it never listens beyond 127.0.0.1.
 */
import type { AddressInfo } from 'node:net'
import type { Logger } from 'pino'
import { SMTPServer } from 'smtp-server'
import type { Db } from '../db/knex'
import { insertOutboxMessage } from './outboxData'
import { parseMessage } from './parseMessage'

export interface CaptureSmtp {
  port: number
  stop(): Promise<void>
}

const maxMessageBytes = 2 * 1024 * 1024

export async function startCaptureSmtp(db: Db, logger: Logger): Promise<CaptureSmtp> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    size: maxMessageBytes,
    banner: 'Cavitrace development mail capture',
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = []
      stream.on('data', (chunk: Buffer) => chunks.push(chunk))
      stream.on('end', () => {
        const raw = Buffer.concat(chunks).toString('utf8')
        const { subject, text } = parseMessage(raw)
        const from = session.envelope.mailFrom ? session.envelope.mailFrom.address : ''
        const to = session.envelope.rcptTo.map((recipient) => recipient.address.toLowerCase())
        insertOutboxMessage(db, { from, to, subject, text, raw }).then(
          () => callback(),
          (error: unknown) => {
            logger.error({ err: error }, 'could not store a captured message')
            callback(new Error('could not store the message'))
          },
        )
      })
    },
  })
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject)
    server.listen(0, '127.0.0.1', () => resolve())
  })
  server.on('error', (error) => logger.warn({ err: error }, 'mail capture error'))
  const { port } = server.server.address() as AddressInfo
  return {
    port,
    stop: () => new Promise<void>((resolve) => server.close(() => resolve())),
  }
}

/**
 * Outgoing e-mail through nodemailer: to the local capture server when MAIL_CAPTURE is on, to
 * SMTP_URL otherwise. Without either, messages are dropped with a warning in the log.
 */
import nodemailer from 'nodemailer'
import type { Logger } from 'pino'
import type { AppConfig } from '../config'

export interface OutgoingMail {
  to: string
  subject: string
  text: string
}

export interface Mailer {
  /** Send now; rejects when the mail server refuses. */
  send(mail: OutgoingMail): Promise<void>
  /** Send in the background (errors only logged), so answers take the same time whether or not mail goes out. */
  sendLater(mail: OutgoingMail): void
  /** Resolve when every background send started so far has finished (used at shutdown). */
  settle(): Promise<void>
}

export function createMailer(config: AppConfig, logger: Logger, options: { capturePort?: number } = {}): Mailer {
  const transport = options.capturePort
    ? nodemailer.createTransport({ host: '127.0.0.1', port: options.capturePort, secure: false, ignoreTLS: true })
    : config.SMTP_URL
      ? nodemailer.createTransport(config.SMTP_URL)
      : null
  if (!transport) logger.warn('no mail server: set SMTP_URL (or MAIL_CAPTURE=on in development); e-mail will not be sent')
  const pending = new Set<Promise<void>>()

  async function send(mail: OutgoingMail): Promise<void> {
    if (!transport) {
      logger.warn({ to: mail.to, subject: mail.subject }, 'e-mail dropped: no mail server configured')
      return
    }
    await transport.sendMail({ from: config.MAIL_FROM, to: mail.to, subject: mail.subject, text: mail.text })
  }

  return {
    send,
    sendLater(mail) {
      const job = send(mail).catch((error: unknown) => logger.error({ err: error, to: mail.to, subject: mail.subject }, 'e-mail could not be sent'))
      pending.add(job)
      void job.finally(() => pending.delete(job))
    },
    async settle() {
      await Promise.all([...pending])
    },
  }
}

/** The wording of the account e-mails. Links carry their token after `#`, so it never reaches server logs or Referer headers. */
import { roleLabels, type Role } from '../../shared/auth/permissions'
import type { OutgoingMail } from './mailer'

export function invitationMail(input: { to: string; role: Role; invitedBy: string; baseUrl: string; token: string; expiresAt: Date }): OutgoingMail {
  const link = `${input.baseUrl}/accept-invitation#token=${input.token}`
  return {
    to: input.to,
    subject: 'You are invited to Cavitrace',
    text: [
      `${input.invitedBy} has invited you to Cavitrace as ${roleLabels[input.role].label}.`,
      '',
      'Choose your name and password here:',
      link,
      '',
      `The link works once and expires on ${input.expiresAt.toISOString().replace('T', ' ').slice(0, 16)} UTC.`,
      'If you did not expect this invitation, ignore this message.',
    ].join('\n'),
  }
}

export function passwordResetMail(input: { to: string; name: string; baseUrl: string; token: string }): OutgoingMail {
  const link = `${input.baseUrl}/reset-password#token=${input.token}`
  return {
    to: input.to,
    subject: 'Reset your Cavitrace password',
    text: [
      `Hello ${input.name},`,
      '',
      'Someone (hopefully you) asked to reset your Cavitrace password. Choose a new one here:',
      link,
      '',
      'The link works once and expires in one hour. If you did not ask for it, ignore this message: your password stays as it is.',
    ].join('\n'),
  }
}

/**
 * The weekly digest for leads: every cavity's latest figures, target status and alerts, and the
 * maintenance of the past week, as one plain-text e-mail per lead. `renderWeeklyDigest` is pure;
 * `sendWeeklyDigest` gathers the data and sends (the scheduled job calls it, and so can a test).
 */
import type { Overview, OverviewRow } from '../../shared/api/overviewTypes'
import type { Db } from '../db/knex'
import { entriesBetween, type LogEntryRecord } from '../logbook/logbookRepository'
import type { Mailer, OutgoingMail } from '../mail/mailer'
import { buildOverview } from '../overview/overviewService'

const DAY_MS = 86_400_000
const alertLabels: Record<string, string> = { fraction_below_target: 'TEM00 below target', finesse_drop: 'finesse drop' }

const day = (iso: string | Date) => (typeof iso === 'string' ? iso : iso.toISOString()).slice(0, 10)
const pct = (value: number | null | undefined) => (value === null || value === undefined ? '—' : `${(value * 100).toFixed(1)} %`)
const points = (value: number | null) => (value === null ? '—' : `${value >= 0 ? '+' : '−'}${Math.abs(value * 100).toFixed(1)} pt`)
const num = (value: number | null | undefined) => (value === null || value === undefined ? '—' : value.toFixed(value >= 100 ? 0 : 1))

function table(headers: string[], rows: string[][]): string[] {
  const widths = headers.map((header, column) => Math.max(header.length, ...rows.map((row) => row[column].length)))
  const line = (cells: string[]) => cells.map((cell, column) => cell.padEnd(widths[column])).join('  ').trimEnd()
  return [line(headers), line(widths.map((width) => '-'.repeat(width))), ...rows.map(line)]
}

function statusText(row: OverviewRow): string {
  if (row.targetStatus === 'none') return row.targetFundamentalFraction === null ? 'no target' : 'no data'
  return row.targetStatus === 'met' ? 'met' : 'BELOW'
}

export function renderWeeklyDigest(input: { overview: Overview; entries: LogEntryRecord[]; cavityNames: Map<string, string>; labName: string; baseUrl: string }): { subject: string; text: string } {
  const { overview, entries, baseUrl } = input
  const rows = overview.cavities
  const below = rows.filter((row) => row.targetStatus === 'below')
  const met = rows.filter((row) => row.targetStatus === 'met')
  const inBreach = rows.filter((row) => row.activeAlerts.length > 0)
  const weekEnd = day(overview.generatedAt)
  const subject = `Cavitrace weekly digest, ${input.labName}: ${met.length} of ${rows.length} cavities on target${below.length > 0 ? `, ${below.length} below` : ''}`
  const text = [
    `Cavitrace weekly digest — ${input.labName}, week to ${weekEnd}`,
    '',
    `${rows.length} cavities: ${met.length} meet their TEM00 target, ${below.length} below, ${rows.length - met.length - below.length} without target or data.`,
    inBreach.length > 0
      ? `Alerts in breach now: ${inBreach.map((row) => `${row.name} (${row.activeAlerts.map((kind) => alertLabels[kind] ?? kind).join(', ')})`).join('; ')}.`
      : 'No alert is in breach.',
    '',
    ...table(
      ['Cavity', 'TEM00', '30 days', 'Finesse', 'Target', 'Status', 'Last analysis', 'Last maintenance'],
      rows.map((row) => [
        row.name,
        pct(row.latest?.fundamentalFraction),
        points(row.fractionChange30d),
        num(row.latest?.finesse),
        pct(row.targetFundamentalFraction),
        statusText(row),
        row.latest ? day(row.latest.createdAt) : '—',
        row.lastMaintenance ? `${day(row.lastMaintenance.occurredAt)} ${row.lastMaintenance.kindLabel}` : '—',
      ]),
    ),
    '',
    'Maintenance this week:',
    ...(entries.length === 0
      ? ['  none logged']
      : entries.map((entry) => {
          const firstLine = entry.text.split('\n')[0].slice(0, 120)
          return `  ${day(entry.occurredAt)}  ${input.cavityNames.get(entry.cavityId) ?? 'cavity'} — ${entry.kindLabel}${entry.authorName ? ` (${entry.authorName})` : ''}${firstLine ? `: ${firstLine}` : ''}`
        })),
    '',
    `The overview: ${baseUrl}/`,
    'You receive this digest because you are a lead in Cavitrace.',
  ].join('\n')
  return { subject, text }
}

/**
 * Build the digest as of `now` and e-mail it to every active lead. One refused address does not stop
 * the others (and the job is not retried for it, which would send the rest twice): it is returned in `failed`.
 */
export async function sendWeeklyDigest(
  context: { db: Db; mailer: Mailer; baseUrl: string },
  options: { now?: Date } = {},
): Promise<{ recipients: string[]; failed: Array<{ to: string; error: string }>; subject: string }> {
  const { db, mailer } = context
  /** @default the current time */
  const now = options.now ?? new Date()
  const [overview, entries, leads, labSetting, cavities] = await Promise.all([
    buildOverview(db, null, { now }),
    entriesBetween(db, new Date(now.getTime() - 7 * DAY_MS), now),
    db('users').where({ role: 'lead' }).whereNull('disabled_at').orderBy('id').select('email') as Promise<Array<{ email: string }>>,
    db('app_settings').where({ key: 'lab_name' }).first('value') as Promise<{ value: unknown } | undefined>,
    db('cavities').select('id', 'name') as Promise<Array<{ id: string; name: string }>>,
  ])
  const labName = typeof labSetting?.value === 'string' ? labSetting.value : 'your lab'
  const { subject, text } = renderWeeklyDigest({ overview, entries, cavityNames: new Map(cavities.map((row) => [row.id, row.name])), labName, baseUrl: context.baseUrl })
  const recipients: string[] = []
  const failed: Array<{ to: string; error: string }> = []
  for (const lead of leads) {
    const mail: OutgoingMail = { to: lead.email, subject, text }
    try {
      await mailer.send(mail)
      recipients.push(lead.email)
    } catch (error) {
      failed.push({ to: lead.email, error: error instanceof Error ? error.message : String(error) })
    }
  }
  return { recipients, failed, subject }
}

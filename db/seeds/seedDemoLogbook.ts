/**
 * The invented demo lab's maintenance log, watchers and alert rules: a cleaning of the 780 nm filter
 * cavity between its scans 7 and 8 (the finesse recovers across it), the realignment after it, an
 * inspection of the 532 nm enhancement cavity's crystal, who watches what, a raised target, finesse-drop thresholds,
 * and the alert states the seeded analyses imply (judged by the real alert check, before anyone
 * watches, so seeding sends no e-mail). Idempotent.
 */
import type { Knex } from 'knex'
import { checkAlertsAfterAnalysis } from '../../server/alerts/checkAlerts'
import { insertEntry, linkTraces } from '../../server/logbook/logbookRepository'

const HOUR_MS = 3_600_000

interface DemoEntry {
  cavity: string
  /** Placed between these two scans (1-based, by time), or this many hours before `afterScan` when `beforeScan` is 0. */
  afterScan: number
  beforeScan: number
  kind: string
  author: string
  text: string
  /** File names of the cavity's scans to attach. */
  attach: string[]
}

const demoEntries: DemoEntry[] = [
  {
    cavity: 'FLT-780 filter cavity',
    afterScan: 7,
    beforeScan: 8,
    kind: 'cleaning',
    author: 'technician@demo.cavitrace.test',
    text: 'Finesse had fallen from about 400 to under 270 over two weeks. Vented the enclosure, cleaned both mirrors (drag wipe, spectroscopic-grade solvent), checked them under a bright light: no scratches.',
    attach: ['scan-007.csv', 'scan-008.csv'],
  },
  {
    cavity: 'FLT-780 filter cavity',
    afterScan: 8,
    beforeScan: 9,
    kind: 'realignment',
    author: 'technician@demo.cavitrace.test',
    text: 'Walked the input beam with the two steering mirrors after the cleaning; TEM00 back above the 80 % target.',
    attach: ['scan-009.csv'],
  },
  {
    cavity: 'SHG-532 enhancement cavity',
    afterScan: 0,
    beforeScan: 1,
    kind: 'inspection',
    author: 'lead@demo.cavitrace.test',
    text: 'Inspected the doubling crystal faces before re-mounting it: one faint spot near the edge, outside the beam path. Left as is.',
    attach: [],
  },
]

const watchers: Array<{ email: string; cavities: string[] }> = [
  { email: 'lead@demo.cavitrace.test', cavities: ['REF-1064 reference cavity', 'FLT-780 filter cavity', 'SHG-532 enhancement cavity'] },
  { email: 'technician@demo.cavitrace.test', cavities: ['FLT-780 filter cavity'] },
  { email: 'experimenter@demo.cavitrace.test', cavities: ['REF-1064 reference cavity', 'SHG-532 enhancement cavity'] },
]

/** Targets the lead has since tightened (the 532 nm cavity got a new crystal), so the demo shows a breach. */
const raisedTargets: Record<string, { from: number; to: number }> = { 'SHG-532 enhancement cavity': { from: 0.7, to: 0.75 } }

/** Percent below the 30-day median finesse that counts as a drop. */
const finesseDropPercents: Record<string, number> = { 'REF-1064 reference cavity': 10, 'FLT-780 filter cavity': 15 }

export async function seedDemoLogbook(knex: Knex): Promise<number> {
  const cavities = new Map(((await knex('cavities').select('id', 'name')) as Array<{ id: string; name: string }>).map((row) => [row.name, row.id]))
  const people = new Map(((await knex('users').select('id', 'email')) as Array<{ id: number; email: string }>).map((row) => [row.email, row.id]))
  let created = 0

  for (const demo of demoEntries) {
    const cavityId = cavities.get(demo.cavity)
    if (!cavityId) continue
    if (await knex('log_entries').where({ cavity_id: cavityId, kind: demo.kind, text: demo.text }).first('id')) continue
    const scans = (await knex('traces').where({ cavity_id: cavityId }).orderBy('uploaded_at').select('id', 'file_name', 'uploaded_at')) as Array<{ id: string; file_name: string; uploaded_at: Date }>
    const later = scans[demo.beforeScan - 1]
    if (!later) continue
    const earlier = demo.afterScan > 0 ? scans[demo.afterScan - 1] : undefined
    const occurredAt = earlier ? new Date((earlier.uploaded_at.getTime() + later.uploaded_at.getTime()) / 2) : new Date(later.uploaded_at.getTime() - 20 * HOUR_MS)
    const entryId = await insertEntry(knex, { cavityId, occurredAt, authorId: people.get(demo.author) ?? null, kind: demo.kind, text: demo.text })
    await linkTraces(
      knex,
      entryId,
      scans.filter((scan) => demo.attach.includes(scan.file_name)).map((scan) => scan.id),
    )
    created += 1
  }

  for (const [name, target] of Object.entries(raisedTargets)) {
    const cavityId = cavities.get(name)
    if (cavityId) await knex('cavities').where({ id: cavityId, target_fundamental_fraction: target.from }).update({ target_fundamental_fraction: target.to })
  }
  for (const [name, percent] of Object.entries(finesseDropPercents)) {
    const cavityId = cavities.get(name)
    if (cavityId) await knex('cavities').where({ id: cavityId }).whereNull('finesse_drop_percent').update({ finesse_drop_percent: percent })
  }
  // Judge each cavity's newest analysis before anyone watches: states without e-mail.
  for (const cavityId of cavities.values()) {
    const newest = (await knex('analyses').where({ cavity_id: cavityId, status: 'done' }).orderBy('created_at', 'desc').first('id')) as { id: string } | undefined
    if (newest) await checkAlertsAfterAnalysis(knex, newest.id)
  }
  for (const watcher of watchers) {
    const userId = people.get(watcher.email)
    if (!userId) continue
    for (const name of watcher.cavities) {
      const cavityId = cavities.get(name)
      if (cavityId) await knex('cavity_watchers').insert({ cavity_id: cavityId, user_id: userId }).onConflict(['cavity_id', 'user_id']).ignore()
    }
  }
  return created
}

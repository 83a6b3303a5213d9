/**
 * The lab at a glance, for leads: every cavity with its latest figures, the 30-day change and series
 * of its TEM00 fraction, its target status, rules in breach, last maintenance and whether the caller
 * watches it. Also the CSV forms of the overview and of a cavity's history.
 */
import Papa from 'papaparse'
import type { Overview, OverviewRow, TargetStatus } from '../../shared/api/overviewTypes'
import { breachedKindsByCavity, watchedCavityIds } from '../alerts/alertRepository'
import type { HistoryRow } from '../analyses/analysisRepository'
import { listCavities } from '../cavities/cavityRepository'
import type { Db } from '../db/knex'
import { latestEntryPerCavity } from '../logbook/logbookRepository'
import { fractionSeriesPerCavity, latestDonePerCavity } from './overviewRepository'

export const OVERVIEW_WINDOW_DAYS = 30
const DAY_MS = 86_400_000

/** A doubtful number (shared/api/resultTrust.ts) neither meets nor misses a target. */
export function targetStatusOf(fraction: number | null | undefined, target: number | null, doubt: string | null = null): TargetStatus {
  if (target === null || fraction === null || fraction === undefined) return 'none'
  if (doubt) return 'doubtful'
  return fraction >= target ? 'met' : 'below'
}

/**
 * `userId` sets `watchedByMe` (null: false everywhere). The 30-day change is the latest fraction
 * minus the newest one at least 30 days old, or, when the cavity has none that old, the oldest one
 * inside the window; null when that is the latest itself.
 */
export async function buildOverview(db: Db, userId: number | null, options: { now?: Date; windowDays?: number } = {}): Promise<Overview> {
  /** @default the current time */
  const now = options.now ?? new Date()
  /** @default 30 */
  const windowDays = options.windowDays ?? OVERVIEW_WINDOW_DAYS
  const windowStart = new Date(now.getTime() - windowDays * DAY_MS)
  const [cavities, latest, old, series, lastEntries, breaches, watched] = await Promise.all([
    listCavities(db),
    latestDonePerCavity(db, now),
    latestDonePerCavity(db, windowStart),
    fractionSeriesPerCavity(db, windowStart, now),
    latestEntryPerCavity(db),
    breachedKindsByCavity(db),
    userId === null ? Promise.resolve(new Set<string>()) : watchedCavityIds(db, userId),
  ])
  // Archived cavities keep their slot too, so un-archiving one changes nobody's colour.
  const slots = new Map(((await db('cavities').orderBy([{ column: 'created_at' }, { column: 'id' }]).select('id')) as Array<{ id: string }>).map((row, i) => [row.id, i]))
  const dropPercents = new Map(((await db('cavities').select('id', 'finesse_drop_percent')) as Array<{ id: string; finesse_drop_percent: number | null }>).map((row) => [row.id, row.finesse_drop_percent]))

  const rows: OverviewRow[] = cavities.map((cavity) => {
    const newest = latest.get(cavity.id) ?? null
    const sparkline = series.get(cavity.id) ?? []
    const baselineFraction = old.get(cavity.id)?.fundamentalFraction ?? (sparkline.length > 1 ? sparkline[0].fundamentalFraction : null)
    const fraction = newest?.fundamentalFraction ?? null
    return {
      cavityId: cavity.id,
      name: cavity.name,
      location: cavity.location,
      wavelengthNm: cavity.wavelengthNm,
      latest: newest && {
        analysisId: newest.analysisId,
        createdAt: newest.createdAt.toISOString(),
        fundamentalFraction: newest.fundamentalFraction,
        finesse: newest.finesse,
        linewidthHz: newest.linewidthHz,
        fundamentalFractionError: newest.fundamentalFractionError,
        doubt: newest.doubt,
      },
      fractionChange30d: fraction === null || baselineFraction === null ? null : fraction - baselineFraction,
      sparkline,
      targetFundamentalFraction: cavity.targetFundamentalFraction,
      targetStatus: targetStatusOf(fraction, cavity.targetFundamentalFraction, newest?.doubt ?? null),
      finesseDropPercent: dropPercents.get(cavity.id) ?? null,
      activeAlerts: breaches.get(cavity.id) ?? [],
      lastMaintenance: lastEntries.get(cavity.id) ?? null,
      watchedByMe: watched.has(cavity.id),
      colourSlot: slots.get(cavity.id) ?? 0,
    }
  })
  return { generatedAt: now.toISOString(), windowDays, cavities: rows }
}

const csvOptions = { escapeFormulae: true, newline: '\r\n' } as const

/** One line per cavity; fractions as 0–1 numbers, times ISO 8601 (RFC 4180 quoting). */
export function overviewCsv(overview: Overview): string {
  return Papa.unparse(
    overview.cavities.map((row) => ({
      cavity: row.name,
      location: row.location,
      latest_analysis_at: row.latest?.createdAt ?? '',
      fundamental_fraction: row.latest?.fundamentalFraction ?? '',
      fraction_change_30d: row.fractionChange30d ?? '',
      finesse: row.latest?.finesse ?? '',
      linewidth_hz: row.latest?.linewidthHz ?? '',
      target_fundamental_fraction: row.targetFundamentalFraction ?? '',
      target_status: row.targetStatus,
      active_alerts: row.activeAlerts.join(' '),
      last_maintenance_at: row.lastMaintenance?.occurredAt ?? '',
      last_maintenance_kind: row.lastMaintenance?.kindLabel ?? '',
      analyses_30d: row.sparkline.length,
    })),
    csvOptions,
  )
}

export function historyCsv(rows: HistoryRow[]): string {
  return Papa.unparse(
    {
      fields: ['created_at', 'analysis_id', 'trace_id', 'file_name', 'note', 'status', 'fundamental_fraction', 'fundamental_fraction_error', 'finesse', 'linewidth_hz', 'doubt', 'excluded_reason'],
      data: rows.map((row) => [
        row.createdAt, row.analysisId, row.traceId, row.fileName, row.note, row.status, row.fundamentalFraction ?? '', row.fundamentalFractionError ?? '', row.finesse ?? '', row.linewidthHz ?? '', row.doubt ?? '', row.excluded?.reason ?? '',
      ]),
    },
    csvOptions,
  )
}

/** Data access for the overview: the latest, the 30-day-old and the recent done analyses of every cavity. */
import type { SparkPoint } from '../../shared/api/overviewTypes'
import { judgeResultTrust, trustInputOf } from '../../shared/api/resultTrust'
import type { Db } from '../db/knex'

export interface DoneFigures {
  analysisId: string
  createdAt: Date
  fundamentalFraction: number | null
  finesse: number | null
  linewidthHz: number | null
  /** The stated one-standard-error of the fraction (null in older results). */
  fundamentalFractionError: number | null
  /** Why the number is in doubt, in one line; null when it can be trusted. */
  doubt: string | null
}

interface FiguresRow {
  cavity_id: string
  id: string
  created_at: Date
  fundamental_fraction: number | null
  finesse: number | null
  linewidth_hz: number | null
  warnings: Array<{ code: string }>
  orders: Record<string, number>
  fraction_error: number | null
}

const figureColumns = ['cavity_id', 'id', 'created_at', 'fundamental_fraction', 'finesse', 'linewidth_hz']

function toFigures(row: FiguresRow): DoneFigures {
  const fraction = row.fundamental_fraction
  const doubt = fraction === null ? null : judgeResultTrust(trustInputOf({ fundamentalFraction: fraction, warnings: row.warnings, orders: row.orders })).summary
  return { analysisId: row.id, createdAt: row.created_at, fundamentalFraction: fraction, finesse: row.finesse, linewidthHz: row.linewidth_hz, fundamentalFractionError: typeof row.fraction_error === 'number' ? row.fraction_error : null, doubt }
}

/** Per cavity, the newest done analysis at or before `at` (not deleted, not excluded). */
export async function latestDonePerCavity(db: Db, at: Date): Promise<Map<string, DoneFigures>> {
  const rows = (await db('analyses')
    .where({ status: 'done' })
    .whereNull('deleted_at')
    .whereNull('excluded_at')
    .andWhere('created_at', '<=', at)
    .distinctOn('cavity_id')
    .orderBy([{ column: 'cavity_id' }, { column: 'created_at', order: 'desc' }])
    .select([...figureColumns, db.raw(`coalesce(result -> 'warnings', '[]'::jsonb) as warnings`), db.raw(`coalesce(result -> 'orders', '{}'::jsonb) as orders`), db.raw(`result -> 'fundamentalFractionError' as fraction_error`)])) as FiguresRow[]
  return new Map(rows.map((row) => [row.cavity_id, toFigures(row)]))
}

/** Per cavity, its done analyses in (from, to], oldest first, as fraction points (not deleted, not excluded). */
export async function fractionSeriesPerCavity(db: Db, from: Date, to: Date): Promise<Map<string, SparkPoint[]>> {
  const rows = (await db('analyses')
    .where({ status: 'done' })
    .whereNull('deleted_at')
    .whereNull('excluded_at')
    .whereNotNull('fundamental_fraction')
    .andWhere('created_at', '>', from)
    .andWhere('created_at', '<=', to)
    .orderBy('created_at')
    .select('cavity_id', 'created_at', 'fundamental_fraction')) as Array<{ cavity_id: string; created_at: Date; fundamental_fraction: number }>
  const series = new Map<string, SparkPoint[]>()
  for (const row of rows) {
    const list = series.get(row.cavity_id) ?? []
    list.push({ t: row.created_at.toISOString(), fundamentalFraction: row.fundamental_fraction })
    series.set(row.cavity_id, list)
  }
  return series
}

/**
 * After an analysis is stored: judge it against its cavity's rules and, when a rule goes into breach,
 * notify the cavity's watchers once (in-app, and an e-mail that the alert mail dispatcher sends). The
 * breach state is kept per cavity and rule, so an ongoing breach is announced only once; a reading
 * that meets the rule again clears it (watchers see that in-app only), and a later breach is announced anew.
 */
import type { Logger } from 'pino'
import { alertKinds, type AlertKind } from '../../shared/api/alertSchemas'
import { judgeResultTrust, trustInputOf } from '../../shared/api/resultTrust'
import type { Db } from '../db/knex'
import { insertNotifications, type NewNotification } from '../notifications/notificationRepository'
import { describeRuleChange, type RuleChange } from './alertMessages'
import { activeWatchers, lockAlertState, setAlertState } from './alertRepository'
import { judgeAlerts } from './judgeAlerts'

/** The finesse median needs a few earlier readings to mean anything (common practice, not a published rule). */
export const MIN_MEDIAN_READINGS = 3
export const MEDIAN_WINDOW_DAYS = 30

export interface AlertOutcome {
  breaches: AlertKind[]
  recoveries: AlertKind[]
  /** Why nothing was judged, when nothing was. */
  skipped?: 'not_done' | 'archived' | 'superseded' | 'excluded'
}

interface AnalysisFacts {
  id: string
  cavity_id: string
  status: string
  created_at: Date
  fundamental_fraction: number | null
  finesse: number | null
  name: string
  archived: boolean
  target_fundamental_fraction: number | null
  finesse_drop_percent: number | null
  excluded: boolean
  warnings: Array<{ code: string }>
  orders: Record<string, number>
}

/** Median finesse of the cavity's done analyses in the window before analysis `analysisId`; null with too few. */
async function recentMedianFinesse(db: Db, cavityId: string, analysisId: string): Promise<number | null> {
  const result = await db.raw<{ rows: Array<{ median: number | null; count: string }> }>(
    `with this as (select created_at from analyses where id = ?)
     select percentile_cont(0.5) within group (order by finesse) as median, count(*) as count from analyses, this
      where cavity_id = ? and status = 'done' and finesse is not null and id <> ? and deleted_at is null and excluded_at is null
        and analyses.created_at <= this.created_at and analyses.created_at > this.created_at - make_interval(days => ?)`,
    [analysisId, cavityId, analysisId, MEDIAN_WINDOW_DAYS],
  )
  const row = result.rows[0]
  return row && Number(row.count) >= MIN_MEDIAN_READINGS ? row.median : null
}

export async function checkAlertsAfterAnalysis(db: Db, analysisId: string): Promise<AlertOutcome> {
  const facts = (await db('analyses as a')
    .join('cavities as c', 'c.id', 'a.cavity_id')
    .where('a.id', analysisId)
    .first(
      'a.id', 'a.cavity_id', 'a.status', 'a.created_at', 'a.fundamental_fraction', 'a.finesse', 'c.name', 'c.archived', 'c.target_fundamental_fraction', 'c.finesse_drop_percent',
      db.raw(`(a.excluded_at is not null or a.deleted_at is not null) as excluded`),
      db.raw(`coalesce(a.result -> 'warnings', '[]'::jsonb) as warnings`),
      db.raw(`coalesce(a.result -> 'orders', '{}'::jsonb) as orders`),
    )) as
    | AnalysisFacts
    | undefined
  if (!facts || facts.status !== 'done') return { breaches: [], recoveries: [], skipped: 'not_done' }
  if (facts.archived) return { breaches: [], recoveries: [], skipped: 'archived' }
  // Excluded from history, trends and alerts by someone who knows it is wrong (or its trace was deleted).
  if (facts.excluded) return { breaches: [], recoveries: [], skipped: 'excluded' }
  // Analyses can finish out of order; a newer reading already decided the state.
  // Compared in SQL: JavaScript dates hold milliseconds, PostgreSQL microseconds.
  const newer = await db('analyses')
    .where({ cavity_id: facts.cavity_id, status: 'done' })
    .whereNull('deleted_at')
    .whereNull('excluded_at')
    .andWhereRaw('created_at > (select created_at from analyses where id = ?)', [facts.id])
    .first('id')
  if (newer) return { breaches: [], recoveries: [], skipped: 'superseded' }

  const settings = { targetFundamentalFraction: facts.target_fundamental_fraction, finesseDropPercent: facts.finesse_drop_percent }
  const medianFinesse = settings.finesseDropPercent === null ? null : await recentMedianFinesse(db, facts.cavity_id, facts.id)
  const verdicts = judgeAlerts({ fundamentalFraction: facts.fundamental_fraction, finesse: facts.finesse, settings, medianFinesse, readingInDoubt: readingInDoubt(facts) })

  return db.transaction(async (trx) => {
    const changes: RuleChange[] = []
    for (const kind of alertKinds) {
      const verdict = verdicts[kind]
      if (verdict === 'off' || verdict === 'unknown') continue
      const state = await lockAlertState(trx, facts.cavity_id, kind)
      if (verdict.breached === state.breached) continue
      await setAlertState(trx, facts.cavity_id, kind, { breached: verdict.breached, since: verdict.breached ? facts.created_at : null, analysisId: facts.id })
      changes.push({ kind, ...verdict, ...(kind === 'finesse_drop' ? { medianFinesse: medianFinesse ?? undefined, dropPercent: settings.finesseDropPercent ?? undefined } : {}) })
    }
    if (changes.length > 0) {
      const watchers = await activeWatchers(trx, facts.cavity_id)
      const notifications: NewNotification[] = watchers.flatMap((watcher) =>
        changes.map((change) => ({
          userId: watcher.id,
          cavityId: facts.cavity_id,
          analysisId: facts.id,
          kind: change.breached ? change.kind : (`${change.kind}_recovered` as const),
          ...describeRuleChange(facts.name, change),
          details: { value: change.value, threshold: change.threshold, ...(change.medianFinesse === undefined ? {} : { medianFinesse: change.medianFinesse, dropPercent: change.dropPercent }) },
          // Only a new breach is e-mailed; a recovery is news, not an alarm.
          mail: change.breached,
        })),
      )
      await insertNotifications(trx, notifications)
    }
    return { breaches: changes.filter((change) => change.breached).map((change) => change.kind), recoveries: changes.filter((change) => !change.breached).map((change) => change.kind) }
  })
}

/** A result whose warnings or shares undermine it (shared/api/resultTrust.ts) neither raises nor clears the target. */
function readingInDoubt(facts: AnalysisFacts): boolean {
  if (facts.fundamental_fraction === null) return false
  return judgeResultTrust(trustInputOf({ fundamentalFraction: facts.fundamental_fraction, warnings: facts.warnings, orders: facts.orders })).doubtful
}

/**
 * After an analysis was excluded or its trace deleted or moved away: judge the cavity's newest remaining done
 * analysis again, so a breach that a wrong upload raised is cleared (or one it cleared is raised again).
 */
export async function rejudgeNewest(db: Db, cavityId: string): Promise<AlertOutcome | null> {
  const newest = (await db('analyses')
    .where({ cavity_id: cavityId, status: 'done' })
    .whereNull('deleted_at')
    .whereNull('excluded_at')
    .orderBy('created_at', 'desc')
    .first('id')) as { id: string } | undefined
  return newest ? checkAlertsAfterAnalysis(db, newest.id) : null
}

/** For the analysis job: never throws (an alert problem must not fail or retry the analysis), logs instead. */
export async function checkAlertsSafely(analysisId: string, context: { db: Db; logger: Logger }): Promise<void> {
  try {
    const outcome = await checkAlertsAfterAnalysis(context.db, analysisId)
    if (outcome.breaches.length > 0 || outcome.recoveries.length > 0) context.logger.info({ analysisId, ...outcome }, 'alert state changed')
  } catch (error) {
    context.logger.error({ err: error, analysisId }, 'could not check the alerts of an analysis')
  }
}

/** Data access for alert settings, watchers and breach states. */
import type { AlertKind, AlertSettings, AlertState } from '../../shared/api/alertSchemas'
import type { Db } from '../db/knex'

export async function readAlertSettings(db: Db, cavityId: string): Promise<AlertSettings | null> {
  const row = (await db('cavities').where({ id: cavityId }).first('target_fundamental_fraction', 'finesse_drop_percent')) as
    | { target_fundamental_fraction: number | null; finesse_drop_percent: number | null }
    | undefined
  return row ? { targetFundamentalFraction: row.target_fundamental_fraction, finesseDropPercent: row.finesse_drop_percent } : null
}

export async function writeAlertSettings(db: Db, cavityId: string, settings: AlertSettings): Promise<void> {
  await db('cavities')
    .where({ id: cavityId })
    .update({ target_fundamental_fraction: settings.targetFundamentalFraction, finesse_drop_percent: settings.finesseDropPercent, updated_at: db.fn.now() })
}

interface StateRow {
  cavity_id: string
  kind: AlertKind
  breached: boolean
  since: Date | null
  analysis_id: string | null
}

function toState(row: StateRow): AlertState {
  return { kind: row.kind, breached: row.breached, since: row.since?.toISOString() ?? null, analysisId: row.analysis_id }
}

export async function listAlertStates(db: Db, cavityId: string): Promise<AlertState[]> {
  return ((await db('cavity_alert_states').where({ cavity_id: cavityId }).orderBy('kind')) as StateRow[]).map(toState)
}

/** Every rule in breach right now, by cavity. */
export async function breachedKindsByCavity(db: Db): Promise<Map<string, AlertKind[]>> {
  const rows = (await db('cavity_alert_states').where({ breached: true }).orderBy('kind').select('cavity_id', 'kind')) as Array<{ cavity_id: string; kind: AlertKind }>
  const byCavity = new Map<string, AlertKind[]>()
  for (const row of rows) byCavity.set(row.cavity_id, [...(byCavity.get(row.cavity_id) ?? []), row.kind])
  return byCavity
}

/** The state of one rule, locked for the rest of the transaction (created as "not breached" if new). */
export async function lockAlertState(trx: Db, cavityId: string, kind: AlertKind): Promise<AlertState> {
  await trx('cavity_alert_states').insert({ cavity_id: cavityId, kind, breached: false }).onConflict(['cavity_id', 'kind']).ignore()
  const row = (await trx('cavity_alert_states').where({ cavity_id: cavityId, kind }).forUpdate().first()) as StateRow
  return toState(row)
}

export async function setAlertState(trx: Db, cavityId: string, kind: AlertKind, state: { breached: boolean; since: Date | null; analysisId: string | null }): Promise<void> {
  await trx('cavity_alert_states')
    .where({ cavity_id: cavityId, kind })
    .update({ breached: state.breached, since: state.since, analysis_id: state.analysisId, updated_at: trx.fn.now() })
}

/** Forget a rule's state (its setting was switched off), so switching it on again starts afresh. */
export async function clearAlertState(db: Db, cavityId: string, kind: AlertKind): Promise<void> {
  await db('cavity_alert_states').where({ cavity_id: cavityId, kind }).delete()
}

export async function addWatcher(db: Db, cavityId: string, userId: number): Promise<void> {
  await db('cavity_watchers').insert({ cavity_id: cavityId, user_id: userId }).onConflict(['cavity_id', 'user_id']).ignore()
}

export async function removeWatcher(db: Db, cavityId: string, userId: number): Promise<void> {
  await db('cavity_watchers').where({ cavity_id: cavityId, user_id: userId }).delete()
}

export async function watcherSummary(db: Db, cavityId: string, userId: number): Promise<{ watching: boolean; watcherCount: number }> {
  const rows = (await db('cavity_watchers').where({ cavity_id: cavityId }).select('user_id')) as Array<{ user_id: number }>
  return { watching: rows.some((row) => row.user_id === userId), watcherCount: rows.length }
}

/** Cavities `userId` watches. */
export async function watchedCavityIds(db: Db, userId: number): Promise<Set<string>> {
  const rows = (await db('cavity_watchers').where({ user_id: userId }).select('cavity_id')) as Array<{ cavity_id: string }>
  return new Set(rows.map((row) => row.cavity_id))
}

/** Active (not disabled) people watching a cavity. */
export async function activeWatchers(db: Db, cavityId: string): Promise<Array<{ id: number; email: string; name: string }>> {
  return (await db('cavity_watchers as w')
    .join('users as u', 'u.id', 'w.user_id')
    .where('w.cavity_id', cavityId)
    .whereNull('u.disabled_at')
    .orderBy('u.id')
    .select('u.id', 'u.email', 'u.name')) as Array<{ id: number; email: string; name: string }>
}

/** Alert settings and watching, per cavity. */
import { alertKinds, type AlertSettings, type CavityAlerts } from '../../shared/api/alertSchemas'
import { getCavity } from '../cavities/cavityService'
import type { Db } from '../db/knex'
import { addWatcher, clearAlertState, listAlertStates, readAlertSettings, removeWatcher, watcherSummary, writeAlertSettings } from './alertRepository'

export async function getCavityAlerts(db: Db, cavityId: string, userId: number): Promise<CavityAlerts> {
  const cavity = await getCavity(db, cavityId)
  const [settings, states, watchers] = await Promise.all([readAlertSettings(db, cavity.id), listAlertStates(db, cavity.id), watcherSummary(db, cavity.id, userId)])
  return { cavityId: cavity.id, settings: settings ?? { targetFundamentalFraction: null, finesseDropPercent: null }, states, ...watchers }
}

export async function setCavityAlerts(db: Db, cavityId: string, settings: AlertSettings, userId: number): Promise<CavityAlerts> {
  const cavity = await getCavity(db, cavityId)
  await writeAlertSettings(db, cavity.id, settings)
  // A rule switched off forgets its breach, so switching it on again announces the next breach.
  const off = { fraction_below_target: settings.targetFundamentalFraction === null, finesse_drop: settings.finesseDropPercent === null }
  for (const kind of alertKinds) if (off[kind]) await clearAlertState(db, cavity.id, kind)
  return getCavityAlerts(db, cavity.id, userId)
}

export async function watchCavity(db: Db, cavityId: string, userId: number, watching: boolean): Promise<{ cavityId: string; watching: boolean; watcherCount: number }> {
  const cavity = await getCavity(db, cavityId)
  if (watching) await addWatcher(db, cavity.id, userId)
  else await removeWatcher(db, cavity.id, userId)
  return { cavityId: cavity.id, ...(await watcherSummary(db, cavity.id, userId)) }
}

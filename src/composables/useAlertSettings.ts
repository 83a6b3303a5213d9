/** One cavity's alert rules and watchers (`/api/cavities/:id/alerts`), saving the rules, and watching it. */
import { shallowRef, toValue, type MaybeRefOrGetter } from 'vue'
import { getCavityAlerts, setCavityAlerts, setWatching, type AlertSettings, type CavityAlerts } from '../api/alerts'
import type { ApiError } from '../api/client'
import { asApiError, runAction, useCavitraceLoader } from './useCavitraceLoader'

export function useAlertSettings(cavityId: MaybeRefOrGetter<string | null | undefined>) {
  const resource = useCavitraceLoader<CavityAlerts>(cavityId, (key, signal) => getCavityAlerts(key, signal))
  /** Whether a save or a watch change is in flight. */
  const saving = shallowRef(false)

  async function save(settings: AlertSettings): Promise<CavityAlerts | { error: ApiError }> {
    const id = toValue(cavityId)
    if (!id) return { error: asApiError(new Error('No cavity is open.')) }
    return runAction(saving, async () => (resource.data.value = await setCavityAlerts(id, settings)))
  }

  async function setWatch(watching: boolean): Promise<{ watching: boolean } | { error: ApiError }> {
    const id = toValue(cavityId)
    if (!id) return { error: asApiError(new Error('No cavity is open.')) }
    return runAction(saving, async () => {
      const answer = await setWatching(id, watching)
      const current = resource.data.value
      if (current) resource.data.value = { ...current, watching: answer.watching, watcherCount: answer.watcherCount }
      return { watching: answer.watching }
    })
  }

  return { ...resource, saving, save, setWatch }
}

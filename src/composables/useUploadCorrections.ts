/**
 * Undo a wrong upload from the analysis page: exclude or include the analysis, move its trace, delete its trace.
 * `allowed` says whether the signed-in person may (their own upload, or anyone's with `uploads.correctAny`); the
 * server decides in the end. Each action resolves to its answer or to `{ error }`.
 */
import { computed, shallowRef, toValue, type MaybeRefOrGetter } from 'vue'
import { deleteTrace, excludeAnalysis, includeAnalysis, moveTrace } from '../api/corrections'
import { useSessionStore } from '../stores/session'
import { runAction } from './useCavitraceLoader'

export function useUploadCorrections(target: MaybeRefOrGetter<{ analysisId: string; traceId: string; uploadedBy: number | null } | null>) {
  const session = useSessionStore()
  /** Whether a correction request is in flight. */
  const busy = shallowRef(false)
  const allowed = computed(() => {
    const current = toValue(target)
    if (!current || !session.can('uploads.correct')) return false
    return session.can('uploads.correctAny') || current.uploadedBy === session.user?.id
  })
  const ids = () => {
    const current = toValue(target)
    if (!current) throw new Error('The analysis is not loaded yet.')
    return current
  }
  return {
    allowed,
    busy,
    exclude: (reason: string) => runAction(busy, () => excludeAnalysis(ids().analysisId, reason)),
    include: () => runAction(busy, () => includeAnalysis(ids().analysisId)),
    move: (cavityId: string, reason = '') => runAction(busy, () => moveTrace(ids().traceId, cavityId, reason)),
    remove: (reason: string) => runAction(busy, () => deleteTrace(ids().traceId, reason)),
  }
}

/**
 * Listen to a cavity's analysis status events (server-sent events). The stream follows the cavity id,
 * reconnects on its own (the browser's EventSource does, with the server's retry hint), and closes when
 * the calling scope ends.
 */
import { onScopeDispose, shallowRef, toValue, watch, type MaybeRefOrGetter } from 'vue'
import { cavityEventsUrl, type AnalysisEvent } from '../api/cavities'

export function useCavityEvents(id: MaybeRefOrGetter<string | null | undefined>, onEvent: (event: AnalysisEvent) => void) {
  /** Whether the stream is open right now. */
  const connected = shallowRef(false)
  let source: EventSource | null = null

  function close() {
    source?.close()
    source = null
    connected.value = false
  }

  function open(cavityId: string) {
    close()
    if (typeof EventSource === 'undefined') return
    const stream = new EventSource(cavityEventsUrl(cavityId), { withCredentials: true })
    stream.onopen = () => (connected.value = true)
    stream.onerror = () => (connected.value = stream.readyState === EventSource.OPEN)
    stream.addEventListener('analysis', (message) => {
      try {
        const event = JSON.parse((message as MessageEvent<string>).data) as AnalysisEvent
        if (event.cavityId === cavityId) onEvent(event)
      } catch {
        // A malformed event is dropped; the next one or a reload brings the page up to date.
      }
    })
    source = stream
  }

  watch(
    () => toValue(id),
    (cavityId) => (cavityId ? open(cavityId) : close()),
    { immediate: true },
  )
  onScopeDispose(close)
  return { connected }
}

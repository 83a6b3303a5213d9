import { parseQuantity } from './parseUnit'

/** Sample interval and start time stated in a file's metadata, in seconds. */
export interface HeaderTiming {
  intervalSeconds: number | null
  startSeconds: number | null
  /** The metadata key the interval came from, for warnings and evidence. */
  intervalKey: string | null
}

const INTERVAL_KEYS =
  /^(?:sample|sampling|time|x)(?:interval|increment|period|step|spacing|resolution)$|^(?:interval|dt|deltat|xincr|xinc|tsample|ts)$/
const RATE_KEYS = /^(?:sample|sampling|acquisition|scan)(?:rate|frequency|freq)$|^(?:fs|srate)$/
const START_KEYS =
  /^(?:start|first|begin|initial)(?:time|x)$|^(?:time|x)(?:offset|origin|start|zero|0)$|^(?:start|t0|tstart|horizontaloffset)$/

/**
 * Find the sample interval (or sample rate) and start time among metadata keys such as "Sample Interval",
 * "Sampling rate", "dt", "Start time" or "X origin"; values may carry a unit ("10 us", "2 MS/s").
 * A value without a unit is taken in seconds (or hertz for a rate).
 */
export function readHeaderTiming(metadata: Record<string, string>): HeaderTiming {
  let intervalSeconds: number | null = null
  let intervalKey: string | null = null
  let startSeconds: number | null = null
  for (const [key, value] of Object.entries(metadata)) {
    const name = key.toLowerCase().replace(/\(.*?\)|\[.*?\]/g, '').replace(/[^a-z0-9]/g, '')
    if (name === '') continue
    const quantity = parseQuantity(value)
    if (!quantity) continue
    const { kind, scale } = quantity.unit
    if (intervalSeconds === null && INTERVAL_KEYS.test(name) && (kind === 'time' || kind === 'none')) {
      if (quantity.value > 0) {
        intervalSeconds = quantity.value * scale
        intervalKey = key
      }
    } else if (intervalSeconds === null && RATE_KEYS.test(name) && (kind === 'rate' || kind === 'none')) {
      if (quantity.value > 0) {
        intervalSeconds = 1 / (quantity.value * scale)
        intervalKey = key
      }
    } else if (startSeconds === null && START_KEYS.test(name) && (kind === 'time' || kind === 'none')) {
      startSeconds = quantity.value * scale
    }
  }
  return { intervalSeconds, startSeconds, intervalKey }
}

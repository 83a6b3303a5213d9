import { formatTraceCsv, type FormatTraceCsvOptions } from '../trace/formatTraceCsv'
import type { SweptTrace } from './types'

/**
 * Write a generated trace as a scope-like text export: the ramp monitor (when generated) and the
 * transmission, in volts, on the generator's time axis. Used by the demo seed and the tests.
 */
export function formatSweptTraceCsv(sim: SweptTrace, options: FormatTraceCsvOptions & { metadata?: Record<string, string> } = {}): string {
  const { metadata, ...format } = options
  const channels = [{ name: 'transmission', unit: 'V', values: sim.transmissionV }]
  if (sim.rampV) channels.unshift({ name: 'ramp', unit: 'V', values: sim.rampV })
  return formatTraceCsv({ sampleInterval: sim.sampleIntervalSeconds, startTime: sim.tSeconds[0], channels, metadata }, format)
}

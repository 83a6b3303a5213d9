import { EngineError } from '../errors'

/**
 * Throws `invalid_sim_options` with `message` unless `condition` holds. The message names the option,
 * the allowed range and the value received, so a caller can fix the call without reading the code.
 */
export function assertSimOption(condition: boolean, message: string): asserts condition {
  if (!condition) throw new EngineError('invalid_sim_options', message)
}

/** True for a finite number inside [min, max]. */
export function isNumberIn(value: unknown, min: number, max: number): value is number {
  return typeof value === 'number' && Number.isFinite(value) && value >= min && value <= max
}

import { EngineError } from '../errors'

/** Throws `invalid_argument` unless `value` is a finite number. */
export function assertFiniteNumber(value: unknown, name: string): asserts value is number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new EngineError('invalid_argument', `${name} must be a finite number, got ${String(value)}`)
  }
}

/** Throws `invalid_argument` unless `value` is a finite number greater than zero. */
export function assertPositive(value: unknown, name: string): asserts value is number {
  assertFiniteNumber(value, name)
  if (value <= 0) throw new EngineError('invalid_argument', `${name} must be greater than 0, got ${value}`)
}

/** Throws `invalid_argument` unless `value` is a finite number strictly between 0 and 1. */
export function assertOpenUnitInterval(value: unknown, name: string): asserts value is number {
  assertFiniteNumber(value, name)
  if (value <= 0 || value >= 1) {
    throw new EngineError('invalid_argument', `${name} must be strictly between 0 and 1, got ${value}`)
  }
}

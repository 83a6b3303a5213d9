/**
 * The one error type the engine throws for bad input. `code` is a stable, machine-readable
 * identifier (snake_case); `message` is a sentence a physicist can act on.
 * The server maps it to HTTP 422 and the command line prints it as `{"error": {code, message}}`.
 */
export class EngineError extends Error {
  /** Stable identifier, e.g. `no_numeric_data`, `unstable_cavity`. */
  readonly code: string
  /** Optional structured details (never shown as a stack trace). */
  readonly details?: Record<string, unknown>

  constructor(code: string, message: string, details?: Record<string, unknown>) {
    super(message)
    this.name = 'EngineError'
    this.code = code
    this.details = details
  }
}

/** True for errors thrown on purpose by the engine (as opposed to bugs). */
export function isEngineError(error: unknown): error is EngineError {
  return error instanceof EngineError
}

/** A non-fatal finding attached to a result: a stable code and a sentence for the user. */
export interface EngineWarning {
  /** Stable identifier, e.g. `undersampled`, `time_axis_repaired`. */
  code: string
  /** What was seen and what it means for the result. */
  message: string
}

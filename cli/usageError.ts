/** The command line itself is wrong (unknown command or option, a missing argument, an unreadable cavity file): exit status 2. */
export class UsageError extends Error {
  readonly code: string

  constructor(code: string, message: string) {
    super(message)
    this.name = 'UsageError'
    this.code = code
  }
}

/**
 * node:util parseArgs with `--help`/`-h` added and its errors turned into usage errors that name the command.
 * Returns null when help was asked for (and printed).
 */
import { parseArgs, type ParseArgsConfig } from 'node:util'
import { UsageError } from './usageError'

type Options = NonNullable<ParseArgsConfig['options']>

export function parseCommandLine<T extends Options>(command: string, args: string[], options: T, help: string) {
  try {
    const withHelp = { ...options, help: { type: 'boolean', short: 'h' } } as const
    const parsed = parseArgs({ args, options: withHelp, allowPositionals: true, strict: true })
    if ((parsed.values as { help?: boolean }).help) {
      process.stdout.write(help)
      return null
    }
    return parsed
  } catch (error) {
    const message = (error as Error).message.replace(/\. To specify a positional argument.*$/s, '.')
    throw new UsageError('bad_argument', `cavitrace ${command}: ${message} (cavitrace ${command} --help)`)
  }
}

/** A positive integer option value, or a usage error naming the option. */
export function positiveInteger(command: string, flag: string, text: string | undefined): number | undefined {
  if (text === undefined) return undefined
  const value = Number(text)
  if (!Number.isInteger(value) || value < 1) throw new UsageError('bad_argument', `cavitrace ${command}: --${flag} needs a positive whole number, not ${JSON.stringify(text)}.`)
  return value
}

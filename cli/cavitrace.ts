/**
 * `cavitrace`: the command-line tool (package bin; built to dist/cli/cavitrace.cjs). One subcommand per job; errors
 * are printed as `{"error": {"code", "message"}}` on stdout. Exit status: 0 ok, 1 analysis refused, 2 usage error.
 */
import { isEngineError } from '../shared/errors'
import { analyzeCommand } from './analyzeCommand'
import { generateCommand } from './generateCommand'
import { inspectCommand } from './inspectCommand'
import { UsageError } from './usageError'
import { watchCommand } from './watchCommand'

export const mainHelp = `Usage: cavitrace COMMAND [options]

  analyze FILE... | DIR --cavity CAVITY.json   analyse exports (one JSON object, or JSON lines / --csv)
  inspect FILE                                  show what the reader sees in an export
  generate --preset NAME --out FILE.csv         write a synthetic trace with known truth
  watch DIR --cavity ID --url URL               upload each new export in DIR to a Cavitrace server

cavitrace COMMAND --help shows a command's options.
Exit status: 0 ok, 1 analysis refused, 2 usage error.
`

type Command = (args: string[]) => number | Promise<number>

const commands: Record<string, Command> = { analyze: analyzeCommand, inspect: inspectCommand, generate: generateCommand, watch: watchCommand }

function printError(code: string, message: string): void {
  process.stdout.write(`${JSON.stringify({ error: { code, message } })}\n`)
}

export async function main(argv: string[]): Promise<number> {
  const [name, ...rest] = argv
  if (name === undefined || name === '--help' || name === '-h' || name === 'help') {
    const topic = name === 'help' ? rest[0] : undefined
    if (topic && topic in commands) return commands[topic](['--help'])
    process.stdout.write(mainHelp)
    return name === undefined ? 2 : 0
  }
  try {
    const command = commands[name]
    if (!command) throw new UsageError('unknown_command', `Unknown command ${JSON.stringify(name)}: use analyze, inspect, generate or watch. (cavitrace --help)`)
    return await command(rest)
  } catch (error) {
    if (error instanceof UsageError) {
      printError(error.code, error.message)
      return 2
    }
    if (isEngineError(error)) {
      printError(error.code, error.message)
      return 1
    }
    printError('internal_error', `cavitrace failed unexpectedly: ${error instanceof Error ? (error.stack ?? error.message) : String(error)}`)
    return 1
  }
}

void main(process.argv.slice(2)).then((code) => {
  process.exitCode = code
})

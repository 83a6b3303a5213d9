/** Entry point: `tsx server/main.ts`. Validates configuration, serves, and shuts down gracefully. */
import { ConfigError, loadConfig } from './config'
import { PortInUseError, startServer } from './server'

async function main(): Promise<void> {
  const config = loadConfig()
  const running = await startServer(config)
  running.logger.info({ url: running.url }, 'Cavitrace is listening')
  process.stdout.write(`CAVITRACE_LISTENING ${running.url}\n`)

  const shutdown = (signal: string) => {
    running.logger.info({ signal }, 'shutting down')
    running.stop().then(
      () => process.exit(0),
      (error: unknown) => {
        running.logger.error({ err: error }, 'shutdown failed')
        process.exit(1)
      },
    )
  }
  process.once('SIGINT', () => shutdown('SIGINT'))
  process.once('SIGTERM', () => shutdown('SIGTERM'))
}

main().catch((error: unknown) => {
  if (error instanceof ConfigError || error instanceof PortInUseError) {
    process.stderr.write(`cavitrace: ${error.message}\n`)
    // 78 (EX_CONFIG): `npm start` does not start again what configuration stops.
    process.exit(78)
  } else {
    process.stderr.write(`cavitrace: could not start: ${error instanceof Error ? error.stack : String(error)}\n`)
  }
  process.exit(1)
})

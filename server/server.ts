/**
 * Start and stop the HTTP server. Exported for tests, which run it in-process on port 0.
 */
import type { Server } from 'node:http'
import type { AddressInfo } from 'node:net'
import pino, { type Logger } from 'pino'
import { createApp } from './app'
import type { AppConfig } from './config'
import { createDb, type Db } from './db/knex'

export interface RunningServer {
  /** Base URL, e.g. http://127.0.0.1:3000 */
  url: string
  port: number
  db: Db
  logger: Logger
  /** Stop accepting connections, finish open requests, close the database pool. */
  stop(): Promise<void>
}

export class PortInUseError extends Error {
  constructor(host: string, port: number) {
    super(`Port ${port} on ${host} is already in use. Stop the program using it or set PORT to another port.`)
    this.name = 'PortInUseError'
  }
}

export async function startServer(config: AppConfig, options: { logger?: Logger } = {}): Promise<RunningServer> {
  const logger = options.logger ?? pino({ level: config.LOG_LEVEL })
  const db = createDb(config.DATABASE_URL, { logger })
  const app = createApp({ config, db, logger })

  const server = await new Promise<Server>((resolve, reject) => {
    const listening = app.listen(config.PORT, config.HOST)
    listening.once('listening', () => resolve(listening))
    listening.once('error', (error: NodeJS.ErrnoException) => {
      reject(error.code === 'EADDRINUSE' ? new PortInUseError(config.HOST, config.PORT) : error)
    })
  }).catch(async (error: unknown) => {
    await db.destroy()
    throw error
  })

  const port = (server.address() as AddressInfo).port
  let stopping: Promise<void> | undefined
  return {
    url: `http://${config.HOST}:${port}`,
    port,
    db,
    logger,
    stop() {
      stopping ??= (async () => {
        await new Promise<void>((resolve) => {
          server.close(() => resolve())
          server.closeIdleConnections()
          // Long-lived connections (event streams) must not hold the shutdown forever.
          setTimeout(() => server.closeAllConnections(), 5000).unref()
        })
        await db.destroy()
      })()
      return stopping
    },
  }
}

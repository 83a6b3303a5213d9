/** `GET /api/health`: is the service up, and can it reach its database? */
import { Router } from 'express'
import type { Db } from '../db/knex'
import { appVersion } from '../version'

/** Ask the database a trivial question; false when it does not answer within `timeoutMs`. */
export async function databaseAnswers(db: Db, timeoutMs = 2000): Promise<boolean> {
  let timer: NodeJS.Timeout | undefined
  const timeout = new Promise<false>((resolve) => {
    timer = setTimeout(() => resolve(false), timeoutMs)
  })
  try {
    const ping = db.raw('select 1').then(() => true as const, () => false as const)
    return await Promise.race([ping, timeout])
  } finally {
    clearTimeout(timer)
  }
}

export function healthRoutes(db: Db): Router {
  const router = Router()
  router.get('/health', async (_req, res) => {
    const dbUp = await databaseAnswers(db)
    res.status(dbUp ? 200 : 503).json({ status: dbUp ? 'ok' : 'degraded', db: dbUp ? 'ok' : 'down', version: appVersion })
  })
  return router
}

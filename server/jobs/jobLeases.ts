/**
 * Leases on running analysis jobs, so a dead worker's job is handed on within seconds rather than after the
 * longest analysis time. A job is sent with a short expiry (LEASE_SECONDS); the process running it renews it
 * (pg-boss's `started_on`) every HEARTBEAT_SECONDS until ANALYSIS_JOB_TIMEOUT_SECONDS have passed. Every working
 * process also fails, so that pg-boss retries them, (a) at start, the running jobs of dead processes on its own
 * host (it can ask the operating system) and (b) on every beat, jobs whose lease nobody renewed for
 * STALE_SECONDS. pg-boss's own supervisor expires a lease after LEASE_SECONDS when no worker is alive at all.
 */
import { hostname } from 'node:os'
import type PgBoss from 'pg-boss'
import type { Logger } from 'pino'
import type { Db } from '../db/knex'

export const LEASE_SECONDS = 20
export const HEARTBEAT_SECONDS = 3
export const STALE_SECONDS = 10

/** This process, as recorded on the analyses it runs. */
export const thisWorker = { host: hostname(), pid: process.pid }

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0)
    return true
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === 'EPERM'
  }
}

export interface JobLeases {
  /** Renew this job's lease until it ends (call `release`). */
  hold(jobId: string): void
  release(jobId: string): void
  stop(): void
}

export async function startJobLeases(boss: PgBoss, queue: string, context: { db: Db; logger: Logger; maxRunSeconds: number }): Promise<JobLeases> {
  const { db, logger, maxRunSeconds } = context
  const held = new Map<string, number>()

  const failJobs = async (ids: string[], why: string) => {
    if (ids.length === 0) return
    for (const id of ids) await boss.fail(queue, id, { message: why })
    logger.warn({ jobs: ids.length, why }, 'handed on analysis jobs')
  }

  // (a) The running analyses of dead processes on this host, at once.
  const mine = (await db('analyses').where({ status: 'running', worker_host: thisWorker.host }).select('id', 'worker_pid')) as Array<{ id: string; worker_pid: number | null }>
  const orphans = mine.filter((row) => row.worker_pid !== null && row.worker_pid !== thisWorker.pid && !isAlive(row.worker_pid)).map((row) => row.id)
  if (orphans.length > 0) {
    const { rows } = await db.raw<{ rows: Array<{ id: string }> }>(`SELECT id FROM pgboss.job WHERE name = ? AND state = 'active' AND data->>'analysisId' = ANY(?)`, [queue, orphans])
    await failJobs(rows.map((row) => row.id), 'its worker on this machine is gone')
  }

  const beat = async () => {
    const now = Date.now()
    const renew = [...held].filter(([, since]) => now - since < maxRunSeconds * 1000).map(([id]) => id)
    if (renew.length > 0) await db.raw(`UPDATE pgboss.job SET started_on = now() WHERE name = ? AND state = 'active' AND id = ANY(?::uuid[])`, [queue, renew])
    // (b) Jobs whose lease nobody renews.
    const { rows } = await db.raw<{ rows: Array<{ id: string }> }>(`SELECT id FROM pgboss.job WHERE name = ? AND state = 'active' AND started_on < now() - (? * interval '1 second')`, [queue, STALE_SECONDS])
    await failJobs(rows.map((row) => row.id).filter((id) => !held.has(id)), 'its worker stopped renewing the lease')
  }
  const timer = setInterval(() => void beat().catch((error: unknown) => logger.warn({ err: error }, 'job lease heartbeat failed')), HEARTBEAT_SECONDS * 1000)
  timer.unref()

  return {
    hold: (jobId) => void held.set(jobId, Date.now()),
    release: (jobId) => void held.delete(jobId),
    stop: () => clearInterval(timer),
  }
}

/**
 * Issue 17, item 6/8 (chaos): PostgreSQL stops and starts again while uploads keep coming. Every upload the server
 * acknowledged (202) is in the database afterwards, every refusal in between was a 503 saying to try again, and
 * the server serves again without a restart. The cluster is this test's own (the suite's is shared).
 */
import { rmSync } from 'node:fs'
import { join } from 'node:path'
import pino from 'pino'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { migrationConfig } from '../../db/migrationSource'
import { LocalPostgres, projectRoot } from '../../scripts/lib/services.mjs'
import { loadConfig } from '../../server/config'
import { createDb } from '../../server/db/knex'
import { startServer, type RunningServer } from '../../server/server'
import { createActor, type TestActor } from '../support/actors'
import { generatedTraceCsv, testCavityGeometry } from '../support/traceFiles'

describe('a database outage under uploads', () => {
  const dir = join(projectRoot, '.data', `outage-${process.pid}`)
  let cluster: LocalPostgres
  let server: RunningServer
  let actor: TestActor
  let cavityId: string

  beforeAll(async () => {
    const clusterUrl = new URL(process.env.CAVITRACE_TEST_PG ?? '')
    cluster = new LocalPostgres({ bin: process.env.CAVITRACE_TEST_PG_BIN ?? '', dir, port: Number(clusterUrl.port) + 100 + (process.pid % 500) })
    await cluster.start()
    await cluster.createDatabase('outage')
    const setup = createDb(cluster.url('outage'), { poolMax: 2 })
    await setup.migrate.latest(migrationConfig)
    await setup.destroy()
    server = await startServer(loadConfig({ NODE_ENV: 'test', PORT: '0', LOG_LEVEL: 'silent', DATABASE_URL: cluster.url('outage'), WORKER_THREADS: '0', DIGEST_SCHEDULE: 'off' }), { logger: pino({ level: process.env.CAVITRACE_TEST_LOG ?? 'silent' }) })
    actor = await createActor(server.db, 'lead')
    const created = await request(server.url).post('/api/cavities').set('Authorization', actor.authorization).send({ name: 'Outage cavity', ...testCavityGeometry })
    cavityId = created.body.cavity.id
  }, 120_000)
  afterAll(async () => {
    await server?.stop()
    cluster?.stop()
    rmSync(dir, { recursive: true, force: true })
  })

  it('when PostgreSQL stops and starts during uploads then every acknowledged upload is stored and the rest were 503', async () => {
    const acknowledged: string[] = []
    const statuses: number[] = []
    let sending = true
    const sender = (async () => {
      for (let k = 0; sending; k++) {
        const response = await request(server.url)
          .post(`/api/cavities/${cavityId}/traces`)
          .set('Authorization', actor.authorization)
          .attach('file', Buffer.from(generatedTraceCsv({ seed: 600 + k, sampleCount: 4000 })), `outage-${k}.csv`)
        statuses.push(response.status)
        if (response.status === 202) acknowledged.push(response.body.uploads[0].trace.sha256)
        else expect(response.body.error.message).toMatch(/try again|in a moment/i)
      }
    })()
    await new Promise((resolve) => setTimeout(resolve, 1500))
    cluster.stop()
    await new Promise((resolve) => setTimeout(resolve, 2000))
    await cluster.start()
    await new Promise((resolve) => setTimeout(resolve, 4000))
    sending = false
    await sender
    expect(statuses.filter((s) => s !== 202 && s !== 503)).toEqual([])
    expect(statuses).toContain(503)
    expect(statuses.slice(-1)).toEqual([202])
    const stored = new Set((await server.db('traces').pluck('sha256')) as string[])
    expect(acknowledged.filter((sha) => !stored.has(sha))).toEqual([])
    expect((await request(server.url).get('/api/cavities').set('Authorization', actor.authorization)).status).toBe(200)
  }, 120_000)
})

/**
 * Issue 17, item 11 (chaos): `npm run backup` dumps a database, `npm run restore` puts it into a fresh one, and
 * a server on the restored copy re-analyses a trace from it — with the same rows and trace hashes.
 */
import { spawnSync } from 'node:child_process'
import { mkdtempSync, statSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import pino from 'pino'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { loadConfig } from '../../server/config'
import { startServer, type RunningServer } from '../../server/server'
import { createActor, type TestActor } from '../support/actors'
import { createTestDatabase, type TestDatabase } from '../support/testDatabase'
import { generatedTraceCsv, testCavityGeometry } from '../support/traceFiles'
import { startTestServer, type TestServer } from '../support/testServer'

function runScript(script: string, args: string[], databaseUrl: string) {
  return spawnSync(process.execPath, [script, ...args], { env: { ...process.env, DATABASE_URL: databaseUrl }, encoding: 'utf8' })
}

async function waitForDone(url: string, actor: TestActor, id: string) {
  for (let k = 0; k < 300; k++) {
    const response = await request(url).get(`/api/analyses/${id}`).set('Authorization', actor.authorization)
    if (response.body.status === 'done' || response.body.status === 'failed') return response.body
    await new Promise((resolve) => setTimeout(resolve, 100))
  }
  throw new Error(`analysis ${id} did not finish`)
}

const counts = async (db: TestServer['db'] | RunningServer['db']) =>
  Object.fromEntries(await Promise.all(['users', 'api_tokens', 'cavities', 'traces', 'analyses'].map(async (table) => [table, Number((await db(table).count<{ count: string }[]>('* as count'))[0].count)])))

describe('backup and restore', () => {
  let source: TestServer
  let fresh: TestDatabase
  let restored: RunningServer | undefined
  let actor: TestActor
  let traceId: string
  beforeAll(async () => {
    source = await startTestServer()
    actor = await createActor(source.db, 'lead')
    const cavity = await request(source.url).post('/api/cavities').set('Authorization', actor.authorization).send({ name: 'Backed-up cavity', ...testCavityGeometry })
    const upload = await request(source.url).post(`/api/cavities/${cavity.body.cavity.id}/traces`).set('Authorization', actor.authorization).attach('file', Buffer.from(generatedTraceCsv({ seed: 41 })), 'kept.csv')
    traceId = upload.body.uploads[0].trace.id
    expect((await waitForDone(source.url, actor, upload.body.uploads[0].analysis.id)).status).toBe('done')
    fresh = await createTestDatabase({ empty: true })
  })
  afterAll(async () => {
    await restored?.stop()
    await fresh?.drop()
    await source?.close()
  })

  it('when a dump is restored into a fresh database then the rows and trace hashes match and a trace re-analyses there', async () => {
    const file = join(mkdtempSync(join(tmpdir(), 'cavitrace-backup-')), 'lab.dump')
    const backup = runScript('scripts/backup.mjs', [file], source.database.url)
    expect(backup.status, backup.stderr).toBe(0)
    expect(statSync(file).mode & 0o777).toBe(0o600)
    const restore = runScript('scripts/restore.mjs', [file], fresh.url)
    expect(restore.status, restore.stderr).toBe(0)

    restored = await startServer(loadConfig({ NODE_ENV: 'test', PORT: '0', LOG_LEVEL: 'silent', DATABASE_URL: fresh.url }), { logger: pino({ level: 'silent' }) })
    expect(await counts(restored.db)).toEqual(await counts(source.db))
    const hashes = async (db: RunningServer['db']) => (await db('traces').orderBy('id').pluck('sha256')) as string[]
    expect(await hashes(restored.db)).toEqual(await hashes(source.db))
    // The lead's API token came along in the dump; it works against the restored copy.
    const rerun = await request(restored.url).post(`/api/traces/${traceId}/analyses`).set('Authorization', actor.authorization).send({})
    expect(rerun.status, JSON.stringify(rerun.body)).toBe(202)
    const analysis = await waitForDone(restored.url, actor, rerun.body.analysis.id)
    expect(analysis.status).toBe('done')
    expect(analysis.result.fundamentalFraction).toBeGreaterThan(0.5)
  })

  it('when restore is given no file or a missing one then it stops with a message', () => {
    const none = runScript('scripts/restore.mjs', [], fresh.url)
    expect(none.status).not.toBe(0)
    expect(none.stderr).toMatch(/name the dump to restore/)
    const missing = runScript('scripts/restore.mjs', ['/nonexistent/lab.dump'], fresh.url)
    expect(missing.stderr).toMatch(/no such file/)
  })
})

import { spawn, type ChildProcess } from 'node:child_process'
import request from 'supertest'
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest'
import { createActor, type TestActor } from '../support/actors'
import { generatedTraceCsv, testCavityGeometry } from '../support/traceFiles'
import { startTestServer, type TestServer } from '../support/testServer'

/** A stand-alone `npm run worker` process on the test database; resolves once it takes jobs. */
function startWorker(databaseUrl: string): Promise<{ child: ChildProcess; log: string[] }> {
  // The built worker when the suite runs the built server; else `node --import tsx` (not the tsx launcher, which
  // forks a second process) so a kill reaches the worker itself.
  const entry = process.env.CAVITRACE_TEST_SERVER === 'built' ? ['dist/server/worker.js'] : ['--import', 'tsx', 'server/worker.ts']
  const child = spawn(process.execPath, entry, {
    env: { ...process.env, NODE_ENV: 'test', DATABASE_URL: databaseUrl, WORKER_THREADS: '1', ANALYSIS_JOB_TIMEOUT_SECONDS: '15', LOG_LEVEL: 'info' },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  const log: string[] = []
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`worker did not start: ${log.join('')}`)), 30_000)
    child.stdout!.on('data', (chunk: Buffer) => {
      log.push(chunk.toString())
      if (chunk.toString().includes('CAVITRACE_WORKER_READY')) {
        clearTimeout(timer)
        resolve({ child, log })
      }
    })
    child.stderr!.on('data', (chunk: Buffer) => log.push(chunk.toString()))
    child.once('exit', (code) => reject(new Error(`worker exited with ${code}: ${log.join('')}`)))
  })
}

function stopWorker(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return Promise.resolve()
  return new Promise((resolve) => {
    child.once('exit', () => resolve())
    child.kill('SIGTERM')
  })
}

async function waitForStatus(server: TestServer, ids: string[], statuses: string[], timeoutMs: number) {
  const deadline = Date.now() + timeoutMs
  for (;;) {
    const rows = (await server.db('analyses').whereIn('id', ids).select('id', 'status', 'attempts')) as Array<{ id: string; status: string; attempts: number }>
    if (rows.length === ids.length && rows.every((row) => statuses.includes(row.status))) return rows
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${statuses.join('/')}: ${JSON.stringify(rows)}`)
    await new Promise((resolve) => setTimeout(resolve, 10))
  }
}

describe('analysis workers as separate processes on one queue', () => {
  let server: TestServer
  let experimenter: TestActor
  let cavityId: string
  const workers: ChildProcess[] = []

  beforeAll(async () => {
    // This app instance only takes uploads; the analyses run in the worker processes.
    server = await startTestServer({ WORKER_THREADS: '0', ANALYSIS_JOB_TIMEOUT_SECONDS: '15' })
    experimenter = await createActor(server.db, 'experimenter')
    const lead = await createActor(server.db, 'lead')
    const created = await request(server.url).post('/api/cavities').set('Authorization', lead.authorization).send({ name: 'Worker cavity', ...testCavityGeometry })
    cavityId = created.body.cavity.id
  })
  afterEach(async () => {
    await Promise.all(workers.splice(0).map(stopWorker))
  })
  afterAll(() => server?.close())

  async function upload(csv: string, name: string): Promise<string> {
    const response = await request(server.url).post(`/api/cavities/${cavityId}/traces`).set('Authorization', experimenter.authorization).attach('file', Buffer.from(csv), name)
    expect(response.status).toBe(202)
    return response.body.uploads[0].analysis.id as string
  }

  it('when two workers share the queue then every job is done exactly once', async () => {
    const [a, b] = await Promise.all([startWorker(server.database.url), startWorker(server.database.url)])
    workers.push(a.child, b.child)
    const ids: string[] = []
    for (let seed = 1; seed <= 6; seed++) ids.push(await upload(generatedTraceCsv({ seed: 100 + seed }), `scan-${seed}.csv`))
    const rows = await waitForStatus(server, ids, ['done'], 60_000)
    expect(rows.map((row) => row.attempts)).toEqual([1, 1, 1, 1, 1, 1])
    // Each analysis was finished by exactly one of the two processes (each logs after storing its result).
    const finishedLines = () => [...a.log, ...b.log].join('').split('\n').filter((line) => line.includes('"analysis finished"'))
    for (let wait = 0; wait < 50 && ids.some((id) => !finishedLines().some((line) => line.includes(id))); wait++) await new Promise((resolve) => setTimeout(resolve, 100))
    for (const id of ids) expect(finishedLines().filter((line) => line.includes(id))).toHaveLength(1)
  }, 120_000)

  it('when a worker is killed mid-job then the job is retried by another and nothing is lost', async () => {
    const first = await startWorker(server.database.url)
    workers.push(first.child)
    // A long record, so the analysis is still running when the worker is killed.
    const id = await upload(generatedTraceCsv({ seed: 5, sampleCount: 1_000_000, fsrCount: 3 }), 'long-scan.csv')
    await waitForStatus(server, [id], ['running'], 30_000)
    first.child.kill('SIGKILL')
    const second = await startWorker(server.database.url)
    workers.push(second.child)
    const [row] = await waitForStatus(server, [id], ['done', 'failed'], 120_000)
    expect(row.status).toBe('done')
    expect(row.attempts).toBe(2)
    const analysis = await request(server.url).get(`/api/analyses/${id}`).set('Authorization', experimenter.authorization)
    expect(analysis.body.result.fundamentalFraction).toBeGreaterThan(0.5)
  }, 180_000)
})

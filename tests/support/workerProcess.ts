/** Stand-alone `npm run worker` processes on a test database, and waiting for analyses to reach a status. */
import { spawn, type ChildProcess } from 'node:child_process'
import request from 'supertest'
import { createActor, type TestActor } from './actors'
import { testCavityGeometry } from './traceFiles'
import { startTestServer, type TestServer } from './testServer'

/** An app instance that only takes uploads (WORKER_THREADS=0), an experimenter and a cavity to upload to. */
export async function uploadOnlyLab(env: Record<string, string>): Promise<{ server: TestServer; experimenter: TestActor; cavityId: string }> {
  const server = await startTestServer({ WORKER_THREADS: '0', ...env })
  const experimenter = await createActor(server.db, 'experimenter')
  const lead = await createActor(server.db, 'lead')
  const created = await request(server.url).post('/api/cavities').set('Authorization', lead.authorization).send({ name: 'Worker cavity', ...testCavityGeometry })
  return { server, experimenter, cavityId: created.body.cavity.id as string }
}

/** A stand-alone `npm run worker` process on the test database; resolves once it takes jobs. */
export function startWorker(databaseUrl: string, env: Record<string, string> = {}): Promise<{ child: ChildProcess; log: string[] }> {
  // The built worker when the suite runs the built server; else `node --import tsx` (not the tsx launcher, which
  // forks a second process) so a kill reaches the worker itself.
  const entry = process.env.CAVITRACE_TEST_SERVER === 'built' ? ['dist/server/worker.js'] : ['--import', 'tsx', 'server/worker.ts']
  const child = spawn(process.execPath, entry, {
    env: { ...process.env, NODE_ENV: 'test', DATABASE_URL: databaseUrl, WORKER_THREADS: '1', ANALYSIS_JOB_TIMEOUT_SECONDS: '15', LOG_LEVEL: 'info', ...env },
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

export function stopWorker(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return Promise.resolve()
  return new Promise((resolve) => {
    child.once('exit', () => resolve())
    child.kill('SIGTERM')
  })
}

export async function waitForStatus(server: TestServer, ids: string[], statuses: string[], timeoutMs: number) {
  const deadline = Date.now() + timeoutMs
  for (;;) {
    const rows = (await server.db('analyses').whereIn('id', ids).select('id', 'status', 'attempts')) as Array<{ id: string; status: string; attempts: number }>
    if (rows.length === ids.length && rows.every((row) => statuses.includes(row.status))) return rows
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${statuses.join('/')}: ${JSON.stringify(rows)}`)
    await new Promise((resolve) => setTimeout(resolve, 10))
  }
}

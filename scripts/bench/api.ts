/**
 * Upload-to-result latency and API read latency, against a real server and a throwaway PostgreSQL
 * on loopback. Targets (PRODUCT.md): upload → result p50 < 1 s for a 100,000-sample trace;
 * API reads p99 < 50 ms at 200 requests/s.
 */
import { rmSync } from 'node:fs'
import { createServer } from 'node:net'
import { join } from 'node:path'
import autocannon from 'autocannon'
import { spawn } from 'node:child_process'
import { migrationConfig } from '../../db/migrationSource'
import { insertCavity } from '../../server/cavities/cavityRepository'
import { createDb } from '../../server/db/knex'
import { newApiToken } from '../../server/tokens/secretTokens'
import { insertToken } from '../../server/tokens/tokensData'
import { insertUser } from '../../server/users/usersData'
import { generatedTraceCsv, testCavityGeometry } from '../../tests/support/traceFiles'
import { LocalPostgres, ensurePostgres, projectRoot } from '../lib/services.mjs'

const UPLOADS = 15

export function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const probe = createServer().listen(0, '127.0.0.1', () => {
      const { port } = probe.address() as { port: number }
      probe.close(() => resolve(port))
    })
  })
}

/** `server/main.ts` in a child process on a free port; resolves with its URL (and process id) once it listens. */
export function startServerProcess(env: Record<string, string>): Promise<{ url: string; pid: number; stop: () => Promise<void> }> {
  const child = spawn(process.execPath, [...(process.env.CAVITRACE_BENCH_PROFILE ? ['--cpu-prof', '--cpu-prof-dir=/tmp/prof'] : []), '--import', 'tsx', 'server/main.ts'], {
    cwd: projectRoot,
    env: { ...process.env, NODE_ENV: 'production', SESSION_SECRET: 'bench-only-secret-bench-only-secret-0123', MAIL_CAPTURE: 'on', PORT: '0', LOG_LEVEL: 'warn', ...env },
    stdio: ['ignore', 'pipe', 'inherit'],
  })
  return new Promise((resolve, reject) => {
    child.once('exit', (code) => reject(new Error(`the server exited with ${code}`)))
    child.stdout!.on('data', (chunk: Buffer) => {
      const match = /CAVITRACE_LISTENING (\S+)/.exec(chunk.toString())
      if (!match) return
      resolve({
        url: match[1],
        pid: child.pid!,
        stop: () =>
          new Promise((done) => {
            child.removeAllListeners('exit')
            child.once('exit', () => done())
            child.kill('SIGTERM')
          }),
      })
    })
  })
}

function percentile(values: number[], p: number): number {
  const sorted = [...values].sort((a, b) => a - b)
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))]
}

/**
 * A throwaway cluster with a migrated database holding one experimenter (with an API token) and one cavity; runs
 * `work` with them and removes the cluster afterwards.
 */
export async function withBenchLab(name: string, work: (lab: { url: string; token: string; cavityId: string }) => Promise<void>): Promise<void> {
  const dir = join(projectRoot, '.data', `${name}-${process.pid}`)
  process.env.CAVITRACE_PG_FSYNC = 'off'
  const cluster = new LocalPostgres({ bin: ensurePostgres(), dir, port: await freePort() })
  await cluster.start()
  try {
    await cluster.createDatabase('bench')
    const url = cluster.url('bench')
    const setupDb = createDb(url, { poolMax: 2 })
    await setupDb.migrate.latest(migrationConfig)
    const user = await insertUser(setupDb, { email: 'bench@bench.cavitrace.test', name: 'Bench', role: 'experimenter', passwordHash: 'x' })
    const token = newApiToken()
    await insertToken(setupDb, { userId: user.id, name: 'bench', prefix: token.prefix, hash: token.hash })
    const cavity = await insertCavity(setupDb, { name: 'Bench cavity', description: '', location: '', ...testCavityGeometry, targetFundamentalFraction: null, archived: false })
    await setupDb.destroy()
    await work({ url, token: token.secret, cavityId: cavity.id })
  } finally {
    cluster.stop()
    rmSync(dir, { recursive: true, force: true })
  }
}

export default async function benchApi(): Promise<void> {
  await withBenchLab('bench', async ({ url, token: secret, cavityId }) => {
    const token = { secret }
    const cavity = { id: cavityId }
    // The server runs in its own process, as in production, so the load generator does not share its event loop.
    const server = await startServerProcess({ DATABASE_URL: url, WORKER_THREADS: '1' })
    const headers = { Authorization: `Bearer ${token.secret}` }
    try {
      // Upload → result: time from sending the file to the "done" event on the cavity's stream.
      const files = Array.from({ length: UPLOADS + 1 }, (_, k) => generatedTraceCsv({ sampleCount: 100_000, fsrCount: 2.5, seed: 500 + k }))
      const doneAt = new Map<string, number>()
      const waiters = new Map<string, () => void>()
      const stream = new AbortController()
      const events = await fetch(`${server.url}/api/cavities/${cavity.id}/events`, { headers, signal: stream.signal })
      void (async () => {
        const reader = events.body!.getReader()
        const decoder = new TextDecoder()
        let buffer = ''
        for (;;) {
          const { value, done } = await reader.read()
          if (done) return
          buffer += decoder.decode(value, { stream: true })
          let cut
          while ((cut = buffer.indexOf('\n\n')) >= 0) {
            const block = buffer.slice(0, cut)
            buffer = buffer.slice(cut + 2)
            const data = /data: (.+)/.exec(block)
            if (!data) continue
            const event = JSON.parse(data[1]) as { analysisId: string; status: string }
            if (event.status === 'done' || event.status === 'failed') {
              doneAt.set(event.analysisId, performance.now())
              waiters.get(event.analysisId)?.()
            }
          }
        }
      })().catch(() => undefined)
      await new Promise((resolve) => setTimeout(resolve, 300))

      const latencies: number[] = []
      for (const [k, csv] of files.entries()) {
        const form = new FormData()
        form.append('file', new Blob([csv]), `bench-${k}.csv`)
        const started = performance.now()
        const response = await fetch(`${server.url}/api/cavities/${cavity.id}/traces`, { method: 'POST', headers, body: form })
        const body = (await response.json()) as { uploads: Array<{ analysis: { id: string } }> }
        const id = body.uploads[0].analysis.id
        if (!doneAt.has(id)) await new Promise<void>((resolve) => waiters.set(id, resolve))
        if (k > 0) latencies.push(doneAt.get(id)! - started) // the first warms the worker thread
      }
      stream.abort()
      const sizeMb = Buffer.byteLength(files[0]) / 1e6
      console.log(`| upload → result, 100,000 samples (${sizeMb.toFixed(1)} MB CSV), ${latencies.length} uploads | p50 ${percentile(latencies, 50).toFixed(0)} ms | p90 ${percentile(latencies, 90).toFixed(0)} ms | target p50 < 1000 ms |`)

      // API reads under a fixed 200 requests/s load.
      const analysisId = [...doneAt.keys()][0]
      for (const path of [`/api/cavities/${cavity.id}/history`, `/api/analyses/${analysisId}`, '/api/cavities', '/api/health']) {
        const result = await autocannon({ url: `${server.url}${path}`, headers, connections: 10, overallRate: 200, duration: 8 })
        console.log(
          `| GET ${path.replace(/[0-9a-f-]{36}/g, ':id')} at 200 req/s for 8 s | p50 ${result.latency.p50} ms | p99 ${result.latency.p99} ms | ${result.requests.total} requests, ${result.non2xx} non-2xx | target p99 < 50 ms |`,
        )
      }

      // Isolation (issue 17): the same read while a burst of 20 uploads (new files) is taken in and analysed.
      const burst = Array.from({ length: 20 }, (_, k) => generatedTraceCsv({ sampleCount: 100_000, fsrCount: 2.5, seed: 700 + k }))
      const reads = autocannon({ url: `${server.url}/api/cavities`, headers, connections: 10, overallRate: 200, duration: 8 })
      await Promise.all(
        burst.map((csv, k) => {
          const form = new FormData()
          form.append('file', new Blob([csv]), `burst-${k}.csv`)
          return fetch(`${server.url}/api/cavities/${cavity.id}/traces`, { method: 'POST', headers, body: form }).then((response) => response.arrayBuffer())
        }),
      )
      const during = await reads
      console.log(`| GET /api/cavities at 200 req/s during a burst of 20 uploads | p50 ${during.latency.p50} ms | p99 ${during.latency.p99} ms | ${during.requests.total} requests, ${during.non2xx} non-2xx | target p99 < 100 ms |`)
    } finally {
      await server.stop()
    }
  })
}

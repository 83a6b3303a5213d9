/**
 * `cavitrace watch` against the real built server in its own process: a file written slowly in pieces is sent once,
 * whole; a temporary file is never sent; a file saved while the server restarts arrives after it is back; the same
 * content saved twice is stored once.
 */
import { spawn, type ChildProcess } from 'node:child_process'
import { createHash } from 'node:crypto'
import { appendFileSync, mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { setTimeout as sleep } from 'node:timers/promises'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createDb, type Db } from '../../server/db/knex'
import { createActor, type TestActor } from '../support/actors'
import { freePort, startServerProcess, type ServerProcess } from '../support/builtServerProcess'
import { projectRoot } from '../support/runCli'
import { createTestDatabase, type TestDatabase } from '../support/testDatabase'
import { generatedTraceCsv, testCavityGeometry } from '../support/traceFiles'

const sha256 = (text: string) => createHash('sha256').update(text).digest('hex')

describe('cavitrace watch', () => {
  let database: TestDatabase
  let db: Db
  let server: ServerProcess
  let port: number
  let experimenter: TestActor
  let cavityId: string
  let folder: string
  let watcher: ChildProcess
  let stdout = ''
  let stderr = ''

  /** Wait until the watcher has printed a line matching `pattern` on stdout (or stderr). */
  async function printed(pattern: RegExp, stream: 'stdout' | 'stderr' = 'stdout', timeoutMs = 45_000): Promise<string> {
    const deadline = Date.now() + timeoutMs
    for (;;) {
      const line = (stream === 'stdout' ? stdout : stderr).split('\n').find((text) => pattern.test(text))
      if (line) return line
      if (Date.now() > deadline) throw new Error(`watcher never printed ${pattern}; stdout:\n${stdout}\nstderr:\n${stderr}`)
      await sleep(100)
    }
  }

  const storedTraces = () => db('traces').where({ cavity_id: cavityId }).orderBy('uploaded_at').select<{ file_name: string; sha256: string }[]>('file_name', 'sha256')

  beforeAll(async () => {
    database = await createTestDatabase()
    db = createDb(database.url, { poolMax: 2 })
    port = await freePort()
    server = await startServerProcess(database.url, port)
    const lead = await createActor(db, 'lead')
    experimenter = await createActor(db, 'experimenter')
    const created = await request(server.url).post('/api/cavities').set('Authorization', lead.authorization).send({ name: 'Watched cavity', ...testCavityGeometry })
    expect(created.status).toBe(201)
    cavityId = created.body.cavity.id
    folder = mkdtempSync(join(tmpdir(), 'cavitrace-watch-'))
    writeFileSync(join(folder, 'before-start.csv'), generatedTraceCsv({ seed: 40 }))
    watcher = spawn(process.execPath, ['bin/cavitrace.mjs', 'watch', folder, '--cavity', cavityId, '--url', server.url, '--settle', '1'], {
      cwd: projectRoot,
      env: { ...process.env, CAVITRACE_TOKEN: experimenter.authorization.replace(/^Bearer /, '') },
    })
    watcher.stdout!.on('data', (chunk: Buffer) => (stdout += chunk.toString()))
    watcher.stderr!.on('data', (chunk: Buffer) => (stderr += chunk.toString()))
    await printed(/watching/, 'stderr')
  })

  afterAll(async () => {
    watcher?.kill('SIGTERM')
    await server?.stop()
    await db?.destroy()
    await database?.drop()
  })

  it('when a file is written slowly in pieces then it is sent once, whole, and its headline printed', async () => {
    const csv = generatedTraceCsv({ seed: 41 })
    const path = join(folder, 'scan-001.csv')
    const pieces = 5
    const size = Math.ceil(csv.length / pieces)
    for (let i = 0; i < pieces; i++) {
      appendFileSync(path, csv.slice(i * size, (i + 1) * size))
      await sleep(400) // shorter than the 1 s settle time: the file is still being written
    }
    writeFileSync(join(folder, 'scan-002.csv.part'), csv.slice(0, size)) // a copy tool's temporary file
    const line = await printed(/^scan-001\.csv: /)
    expect(line).toMatch(/^scan-001\.csv: TEM00 \d+\.\d %/)
    const traces = await storedTraces()
    expect(traces).toEqual([{ file_name: 'scan-001.csv', sha256: sha256(csv) }])
  })

  it('when the server restarts while a file is saved then the file arrives once the server is back', async () => {
    await server.stop()
    const csv = generatedTraceCsv({ seed: 42, orderPowers: [0.6, 0.25, 0.1, 0.05] })
    writeFileSync(join(folder, 'scan-003.csv'), csv)
    await printed(/uploading scan-003\.csv: .*trying again/, 'stderr')
    server = await startServerProcess(database.url, port)
    const line = await printed(/^scan-003\.csv: /)
    expect(line).toMatch(/^scan-003\.csv: TEM00 \d+\.\d %/)
    expect((await storedTraces()).map((trace) => trace.sha256)).toEqual([sha256(generatedTraceCsv({ seed: 41 })), sha256(csv)])
  })

  it('when the same content is saved twice then it is stored once, and nothing else was sent', async () => {
    const again = generatedTraceCsv({ seed: 41 })
    writeFileSync(join(folder, 'scan-001-copy.csv'), again)
    writeFileSync(join(folder, 'scan-001.csv'), again) // saved again over itself: a new time stamp, the same bytes
    await printed(/^scan-001-copy\.csv: same content as scan-001\.csv, already sent$/)
    await printed(/^scan-001\.csv: same content as scan-001\.csv, already sent$/)
    const traces = await storedTraces()
    expect(traces.map((trace) => trace.file_name)).toEqual(['scan-001.csv', 'scan-003.csv'])
    // The file present before the watcher started and the temporary file were never sent.
    expect(stdout).not.toMatch(/before-start|\.part/)
  })
})

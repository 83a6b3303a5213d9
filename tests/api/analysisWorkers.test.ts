import type { ChildProcess } from 'node:child_process'
import request from 'supertest'
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest'
import type { TestActor } from '../support/actors'
import { generatedTraceCsv } from '../support/traceFiles'
import type { TestServer } from '../support/testServer'
import { startWorker, stopWorker, uploadOnlyLab, waitForStatus } from '../support/workerProcess'

describe('analysis workers as separate processes on one queue', () => {
  let server: TestServer
  let experimenter: TestActor
  let cavityId: string
  const workers: ChildProcess[] = []

  beforeAll(async () => {
    // This app instance only takes uploads; the analyses run in the worker processes.
    ;({ server, experimenter, cavityId } = await uploadOnlyLab({ ANALYSIS_JOB_TIMEOUT_SECONDS: '15' }))
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

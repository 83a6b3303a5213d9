import { spawnSync } from 'node:child_process'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createActor, type TestActor } from '../support/actors'
import { generatedTraceCsv, testCavityGeometry, writeTempFile } from '../support/traceFiles'
import { startTestServer, type TestServer } from '../support/testServer'

/** Poll an analysis until it is done or failed. */
async function waitForAnalysis(server: TestServer, actor: TestActor, id: string, timeoutMs = 30_000) {
  const deadline = Date.now() + timeoutMs
  for (;;) {
    const response = await request(server.url).get(`/api/analyses/${id}`).set('Authorization', actor.authorization)
    expect(response.status).toBe(200)
    if (response.body.status === 'done' || response.body.status === 'failed') return response.body
    if (Date.now() > deadline) throw new Error(`analysis ${id} still ${response.body.status} after ${timeoutMs} ms`)
    await new Promise((resolve) => setTimeout(resolve, 100))
  }
}

describe('the tuning loop: cavities, uploads, analyses', () => {
  let server: TestServer
  let lead: TestActor
  let experimenter: TestActor
  let viewer: TestActor
  let cavityId: string
  const csv = generatedTraceCsv()

  beforeAll(async () => {
    server = await startTestServer()
    lead = await createActor(server.db, 'lead')
    experimenter = await createActor(server.db, 'experimenter')
    viewer = await createActor(server.db, 'viewer')
    const created = await request(server.url)
      .post('/api/cavities')
      .set('Authorization', lead.authorization)
      .send({ name: 'Test reference cavity', location: 'Table 2', ...testCavityGeometry, targetFundamentalFraction: 0.85 })
    expect(created.status).toBe(201)
    cavityId = created.body.cavity.id
  })
  afterAll(() => server?.close())

  it('when a lead sends an unstable geometry then it is refused with a message naming it', async () => {
    const response = await request(server.url)
      .post('/api/cavities')
      .set('Authorization', lead.authorization)
      .send({ name: 'Too long', wavelengthNm: 1064, lengthMm: 600, roc1Mm: null, roc2Mm: 500 })
    expect(response.status).toBe(422)
    expect(response.body.error.code).toBe('unstable_cavity')
    expect(response.body.error.message).toMatch(/g1|g2|stab/i)
  })

  it('when a viewer tries to create a cavity then it is forbidden, and reading is allowed', async () => {
    const refused = await request(server.url).post('/api/cavities').set('Authorization', viewer.authorization).send({ name: 'x', ...testCavityGeometry })
    expect(refused.status).toBe(403)
    const read = await request(server.url).get(`/api/cavities/${cavityId}`).set('Authorization', viewer.authorization)
    expect(read.status).toBe(200)
    // The computed card: FSR = c / 2L for L = 100 mm (common practice formula).
    expect(read.body.model.fsrHz).toBeCloseTo(299_792_458 / 0.2, 0)
  })

  it('when a trace is uploaded then it is queued, analysed off the request thread, and equals the command line output', async () => {
    const upload = await request(server.url)
      .post(`/api/cavities/${cavityId}/traces`)
      .set('Authorization', experimenter.authorization)
      .field('note', 'after moving the second lens +1 mm')
      .attach('file', Buffer.from(csv), 'scan-001.csv')
    expect(upload.status).toBe(202)
    const [first] = upload.body.uploads
    expect(first.created).toBe(true)
    expect(['queued', 'running', 'done']).toContain(first.analysis.status)
    expect(first.trace.note).toBe('after moving the second lens +1 mm')

    const analysis = await waitForAnalysis(server, experimenter, first.analysis.id)
    expect(analysis.status).toBe('done')
    expect(analysis.geometry).toMatchObject(testCavityGeometry)

    const tracePath = writeTempFile('scan-001.csv', csv)
    const cavityPath = writeTempFile('cavity.json', JSON.stringify(testCavityGeometry))
    const cli = spawnSync(process.execPath, ['bin/cavitrace.mjs', 'analyze', tracePath, '--cavity', cavityPath], { encoding: 'utf8' })
    expect(cli.status).toBe(0)
    expect(analysis.result).toEqual(JSON.parse(cli.stdout))
  })

  it('when the same file is uploaded twice then it links to the one stored trace', async () => {
    const again = await request(server.url).post(`/api/cavities/${cavityId}/traces`).set('Authorization', experimenter.authorization).attach('file', Buffer.from(csv), 'scan-001-copy.csv')
    expect(again.status).toBe(202)
    expect(again.body.uploads[0].created).toBe(false)
    const rows = await server.db('traces').where({ cavity_id: cavityId }).count<{ count: string }[]>('* as count')
    expect(Number(rows[0].count)).toBe(1)
  })

  it('when a file is not a trace then its analysis fails with a clear error and the file is kept', async () => {
    const upload = await request(server.url)
      .post(`/api/cavities/${cavityId}/traces`)
      .set('Authorization', experimenter.authorization)
      .attach('file', Buffer.from('<!doctype html><html><body>Not a trace</body></html>'), 'page.html')
    expect(upload.status).toBe(202)
    const analysis = await waitForAnalysis(server, experimenter, upload.body.uploads[0].analysis.id)
    expect(analysis.status).toBe('failed')
    expect(analysis.error.code).toBeTruthy()
    expect(analysis.error.message).toMatch(/HTML|not a|numeric/i)
    const file = await request(server.url).get(`/api/traces/${upload.body.uploads[0].trace.id}/file`).set('Authorization', viewer.authorization)
    expect(file.status).toBe(200)
    expect(file.text).toContain('Not a trace')
  })

  it('when a trace is re-analysed with options then a new analysis is made and the old one kept', async () => {
    const history = await request(server.url).get(`/api/cavities/${cavityId}/history`).set('Authorization', viewer.authorization)
    const done = history.body.analyses.find((row: { status: string }) => row.status === 'done')
    const rerun = await request(server.url).post(`/api/traces/${done.traceId}/analyses`).set('Authorization', experimenter.authorization).send({ peakModel: 'lorentzian' })
    expect(rerun.status).toBe(202)
    expect(rerun.body.analysis.id).not.toBe(done.analysisId)
    const finished = await waitForAnalysis(server, experimenter, rerun.body.analysis.id)
    expect(finished.options).toEqual({ peakModel: 'lorentzian' })
    const trace = await request(server.url).get(`/api/traces/${done.traceId}`).set('Authorization', viewer.authorization)
    expect(trace.body.analyses.map((a: { id: string }) => a.id)).toEqual(expect.arrayContaining([done.analysisId, rerun.body.analysis.id]))

    const refused = await request(server.url).post(`/api/traces/${done.traceId}/analyses`).set('Authorization', viewer.authorization).send({})
    expect(refused.status).toBe(403)
    const badOption = await request(server.url).post(`/api/traces/${done.traceId}/analyses`).set('Authorization', experimenter.authorization).send({ peakModel: 'gaussian' })
    expect(badOption.status).toBe(400)
    expect(badOption.body.error.message).toContain('peakModel')

    // The sweep direction a lab knows settles a mirrored reading: accepted, kept with the analysis, and checked.
    const directed = await request(server.url).post(`/api/traces/${done.traceId}/analyses`).set('Authorization', experimenter.authorization).send({ sweepDirection: 'down' })
    expect(directed.status).toBe(202)
    const directedDone = await waitForAnalysis(server, experimenter, directed.body.analysis.id)
    expect(directedDone.options).toEqual({ sweepDirection: 'down' })
    expect(directedDone.result.sweep.direction).toBe('down')
    const badDirection = await request(server.url).post(`/api/traces/${done.traceId}/analyses`).set('Authorization', experimenter.authorization).send({ sweepDirection: 'sideways' })
    expect(badDirection.status).toBe(400)
    expect(badDirection.body.error.message).toContain('sweepDirection')
  })

  it('when the history is read then it lists the analyses newest first with note, fraction and status', async () => {
    const response = await request(server.url).get(`/api/cavities/${cavityId}/history`).set('Authorization', viewer.authorization)
    expect(response.status).toBe(200)
    const rows = response.body.analyses as Array<{ createdAt: string; status: string; note: string; fundamentalFraction: number | null }>
    expect(rows.length).toBeGreaterThanOrEqual(3)
    const times = rows.map((row) => Date.parse(row.createdAt))
    expect([...times].sort((a, b) => b - a)).toEqual(times)
    const done = rows.find((row) => row.status === 'done' && row.note.includes('second lens'))
    expect(done?.fundamentalFraction).toBeGreaterThan(0.5)
    const empty = await request(server.url).get(`/api/cavities/${cavityId}/history?to=2000-01-01`).set('Authorization', viewer.authorization)
    expect(empty.body.analyses).toEqual([])
  })

  it('when a script uploads then the cavity event stream announces the result', async () => {
    const received: Array<{ status: string; analysisId: string }> = []
    const controller = new AbortController()
    const stream = await fetch(`${server.url}/api/cavities/${cavityId}/events`, { headers: { Authorization: viewer.authorization }, signal: controller.signal })
    expect(stream.headers.get('content-type')).toContain('text/event-stream')
    const reader = stream.body!.getReader()
    const reading = (async () => {
      let buffer = ''
      for (;;) {
        const { value, done } = await reader.read()
        if (done) return
        buffer += new TextDecoder().decode(value)
        for (const match of buffer.matchAll(/data: (.+)\n/g)) received.push(JSON.parse(match[1]))
        buffer = buffer.slice(buffer.lastIndexOf('\n') + 1)
        if (received.some((event) => event.status === 'done')) return
      }
    })().catch(() => undefined)
    await new Promise((resolve) => setTimeout(resolve, 300)) // the listener connects lazily
    const upload = await request(server.url)
      .post(`/api/cavities/${cavityId}/traces`)
      .set('Authorization', experimenter.authorization)
      .attach('file', Buffer.from(generatedTraceCsv({ seed: 99 })), 'scan-002.csv')
    const analysisId = upload.body.uploads[0].analysis.id
    await Promise.race([reading, new Promise((resolve) => setTimeout(resolve, 20_000))])
    controller.abort()
    const mine = received.filter((event) => event.analysisId === analysisId).map((event) => event.status)
    expect(mine).toContain('done')
  })
})

describe('upload limits', () => {
  let server: TestServer
  let experimenter: TestActor
  let cavityId: string
  beforeAll(async () => {
    server = await startTestServer({ UPLOAD_LIMIT_MB: '0.01' })
    experimenter = await createActor(server.db, 'experimenter')
    const lead = await createActor(server.db, 'lead')
    const created = await request(server.url).post('/api/cavities').set('Authorization', lead.authorization).send({ name: 'Small', ...testCavityGeometry })
    cavityId = created.body.cavity.id
  })
  afterAll(() => server?.close())

  it('when a file is over the limit then the answer is 413 naming the limit and nothing is stored', async () => {
    const big = Buffer.alloc(20_000, '1\n')
    const response = await request(server.url).post(`/api/cavities/${cavityId}/traces`).set('Authorization', experimenter.authorization).attach('file', big, 'big.csv')
    expect(response.status).toBe(413)
    expect(response.body.error).toEqual({ code: 'file_too_large', message: expect.stringContaining('0.01 MB') })
    const rows = await server.db('traces').count<{ count: string }[]>('* as count')
    expect(Number(rows[0].count)).toBe(0)
  })

  it('when no file is sent then the answer names the field to use', async () => {
    const response = await request(server.url).post(`/api/cavities/${cavityId}/traces`).set('Authorization', experimenter.authorization).field('note', 'x')
    expect(response.status).toBe(400)
    expect(response.body.error.message).toContain('"file"')
  })
})


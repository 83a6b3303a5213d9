/**
 * One-column exports (issue 13): a file of bare transmission values needs the sample interval. It can be given with
 * the upload or the re-analysis, is remembered per cavity, and is then used for the next such export, while a file
 * with its own time column keeps its axis. Invented data.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createActor, type TestActor } from '../support/actors'
import { generatedTraceCsv, oneColumnTraceCsv, testCavityGeometry } from '../support/traceFiles'
import { startTestServer, type TestServer } from '../support/testServer'

describe('one-column exports and the sample interval', () => {
  let server: TestServer
  let experimenter: TestActor
  let cavityId: string

  async function finished(id: string) {
    const deadline = Date.now() + 30_000
    for (;;) {
      const response = await request(server.url).get(`/api/analyses/${id}`).set('Authorization', experimenter.authorization)
      if (response.body.status === 'done' || response.body.status === 'failed') return response.body
      if (Date.now() > deadline) throw new Error(`analysis ${id} still ${response.body.status}`)
      await new Promise((resolve) => setTimeout(resolve, 100))
    }
  }
  const upload = (content: string, name: string, interval?: string) => {
    const call = request(server.url).post(`/api/cavities/${cavityId}/traces`).set('Authorization', experimenter.authorization)
    if (interval !== undefined) call.field('sampleIntervalSeconds', interval)
    return call.attach('file', Buffer.from(content), name)
  }
  const cavityInterval = async () => (await request(server.url).get(`/api/cavities/${cavityId}`).set('Authorization', experimenter.authorization)).body.cavity.sampleIntervalSeconds

  beforeAll(async () => {
    server = await startTestServer()
    experimenter = await createActor(server.db, 'experimenter')
    const lead = await createActor(server.db, 'lead')
    cavityId = (await request(server.url).post('/api/cavities').set('Authorization', lead.authorization).send({ name: 'One-column cavity', ...testCavityGeometry })).body.cavity.id
  })
  afterAll(() => server?.close())

  it('when a one-column export comes without an interval then it fails saying so, and a re-analysis with the interval reads it', async () => {
    const first = await upload(oneColumnTraceCsv({ seed: 51 }), 'bare-1.csv')
    expect(first.status).toBe(202)
    const failed = await finished(first.body.uploads[0].analysis.id)
    expect(failed.status).toBe('failed')
    expect(failed.error.code).toBe('no_sample_interval')
    expect(await cavityInterval()).toBeNull()

    expect((await request(server.url).post(`/api/traces/${first.body.uploads[0].trace.id}/analyses`).set('Authorization', experimenter.authorization).send({ sampleIntervalSeconds: 10 })).status).toBe(400)
    const again = await request(server.url).post(`/api/traces/${first.body.uploads[0].trace.id}/analyses`).set('Authorization', experimenter.authorization).send({ sampleIntervalSeconds: 1e-5 })
    expect(again.status).toBe(202)
    const done = await finished(again.body.analysis.id)
    expect(done.status).toBe('done')
    expect(done.result.fundamentalFraction).toBeGreaterThan(0.75)
    expect(await cavityInterval()).toBe(1e-5)
  })

  it('when the next one-column export comes without an interval then the remembered one is used, and an upload field overrides it', async () => {
    const next = await upload(oneColumnTraceCsv({ seed: 52 }), 'bare-2.csv')
    expect((await finished(next.body.uploads[0].analysis.id)).status).toBe('done')

    const given = await upload(oneColumnTraceCsv({ seed: 53, sampleIntervalSeconds: 2e-5 }), 'bare-3.csv', '2e-5')
    expect(given.status).toBe(202)
    expect(given.body.uploads[0].analysis.options).toEqual({ sampleIntervalSeconds: 2e-5 })
    expect((await finished(given.body.uploads[0].analysis.id)).status).toBe('done')
    expect(await cavityInterval()).toBe(2e-5)
    expect((await upload(oneColumnTraceCsv({ seed: 54 }), 'bare-4.csv', '-1')).status).toBe(400)
  })

  it('when an export has its own time column then the remembered interval does not touch it', async () => {
    const timed = await upload(generatedTraceCsv({ seed: 55 }), 'timed.csv')
    const done = await finished(timed.body.uploads[0].analysis.id)
    expect(done.status).toBe('done')
    expect(done.result.warnings.map((w: { code: string }) => w.code)).not.toContain('interval_overridden')
    // The generator's FSR on the time axis: about 0.2 s of 10 µs samples over 2.2 FSR (not rescaled by 2e-5 s).
    expect(done.result.fsr.seconds).toBeGreaterThan(0.05)
    expect(done.result.fsr.seconds).toBeLessThan(0.15)
  })
})

/**
 * History ranges and CSV, the leads' overview and its CSV, and the comparison of two analyses (issue 7).
 * Analyses are made by uploading generated traces, then moved in time in the database, so the date
 * ranges and the 30-day window are exact.
 */
import Papa from 'papaparse'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createActor, type TestActor } from '../support/actors'
import { generatedTraceCsv, testCavityGeometry } from '../support/traceFiles'
import { startTestServer, type TestServer } from '../support/testServer'

const DAY_MS = 86_400_000

describe('history, overview and comparison', () => {
  let server: TestServer
  let lead: TestActor
  let viewer: TestActor
  let cavityId: string
  const now = Date.now()
  /** Three done analyses 40, 10 and 1 days ago, oldest first. */
  const scans: Array<{ analysisId: string; traceId: string; at: Date; fraction: number }> = []
  let failedAnalysisId: string

  const get = (actor: TestActor, path: string) => request(server.url).get(path).set('Authorization', actor.authorization)

  async function uploadAndWait(csv: string, name: string, note: string) {
    const response = await request(server.url).post(`/api/cavities/${cavityId}/traces`).set('Authorization', lead.authorization).field('note', note).attach('file', Buffer.from(csv), name)
    expect(response.status).toBe(202)
    const { trace, analysis } = response.body.uploads[0]
    const deadline = Date.now() + 30_000
    for (;;) {
      const row = (await server.db('analyses').where({ id: analysis.id }).first('status', 'fundamental_fraction')) as { status: string; fundamental_fraction: number | null }
      if (row.status === 'done' || row.status === 'failed') return { traceId: trace.id as string, analysisId: analysis.id as string, status: row.status, fraction: row.fundamental_fraction ?? Number.NaN }
      if (Date.now() > deadline) throw new Error(`analysis of ${name} did not finish`)
      await new Promise((resolve) => setTimeout(resolve, 100))
    }
  }

  beforeAll(async () => {
    server = await startTestServer()
    lead = await createActor(server.db, 'lead')
    viewer = await createActor(server.db, 'viewer')
    const create = async (name: string, target: number | null) => {
      const response = await request(server.url).post('/api/cavities').set('Authorization', lead.authorization).send({ name, ...testCavityGeometry, targetFundamentalFraction: target })
      expect(response.status).toBe(201)
      return response.body.cavity.id as string
    }
    cavityId = await create('Overview main cavity', 0.7)
    await create('Overview empty cavity', null)
    const archivedId = await create('Overview archived cavity', 0.5)
    await request(server.url).patch(`/api/cavities/${archivedId}`).set('Authorization', lead.authorization).send({ archived: true })

    const plan = [
      { daysAgo: 40, orderPowers: [0.6, 0.25, 0.1, 0.05], note: 'first scan' },
      { daysAgo: 10, orderPowers: [0.75, 0.15, 0.07, 0.03], note: '=SUM(A1) "quoted", and a comma' },
      { daysAgo: 1, orderPowers: [0.85, 0.08, 0.05, 0.02], note: 'after walking the beam' },
    ]
    for (const [index, step] of plan.entries()) {
      const made = await uploadAndWait(generatedTraceCsv({ orderPowers: step.orderPowers, seed: 300 + index }), `scan-${index + 1}.csv`, step.note)
      expect(made.status).toBe('done')
      const at = new Date(now - step.daysAgo * DAY_MS)
      await server.db('analyses').where({ id: made.analysisId }).update({ created_at: at })
      scans.push({ ...made, at })
    }
    const failed = await uploadAndWait('<html>not a trace</html>', 'page.html', 'not a trace')
    expect(failed.status).toBe('failed')
    failedAnalysisId = failed.analysisId
    await server.db('analyses').where({ id: failedAnalysisId }).update({ created_at: new Date(now - 20 * DAY_MS) })
  })
  afterAll(() => server?.close())

  it('when the history is asked for a date range then only analyses inside it come back, newest first, with linewidth', async () => {
    const ids = async (query: string) => ((await get(viewer, `/api/cavities/${cavityId}/history${query}`)).body.analyses as Array<{ analysisId: string }>).map((row) => row.analysisId)
    const [old, middle, recent] = scans.map((scan) => scan.analysisId)
    expect(await ids('')).toEqual([recent, middle, failedAnalysisId, old])
    expect(await ids(`?from=${new Date(now - 15 * DAY_MS).toISOString()}`)).toEqual([recent, middle])
    expect(await ids(`?to=${new Date(now - 15 * DAY_MS).toISOString()}`)).toEqual([failedAnalysisId, old])
    // Both ends are inclusive.
    expect(await ids(`?from=${scans[1].at.toISOString()}&to=${scans[1].at.toISOString()}`)).toEqual([middle])
    expect(await ids('?limit=1')).toEqual([recent])
    const rows = (await get(viewer, `/api/cavities/${cavityId}/history`)).body.analyses as Array<{ analysisId: string; linewidthHz: number | null; finesse: number | null }>
    const newest = rows[0]
    // Linewidth = FSR / finesse (Siegman, "Lasers" (1986), ch. 11); FSR = c / 2L for L = 100 mm.
    expect(newest.linewidthHz! * newest.finesse!).toBeCloseTo(299_792_458 / 0.2, -4)
  })

  it('when the history is exported as CSV then it holds the same rows, quoted, with formulas defused', async () => {
    const response = await get(viewer, `/api/cavities/${cavityId}/history.csv?from=${new Date(now - 15 * DAY_MS).toISOString()}`)
    expect(response.status).toBe(200)
    expect(response.headers['content-type']).toMatch(/^text\/csv/)
    expect(response.headers['content-disposition']).toContain('Overview_main_cavity-history.csv')
    const parsed = Papa.parse<Record<string, string>>(response.text, { header: true, skipEmptyLines: true })
    expect(parsed.errors).toEqual([])
    expect(parsed.meta.fields).toEqual(['created_at', 'analysis_id', 'trace_id', 'file_name', 'note', 'status', 'fundamental_fraction', 'fundamental_fraction_error', 'finesse', 'linewidth_hz', 'doubt', 'excluded_reason'])
    expect(parsed.data.map((row) => row.analysis_id)).toEqual([scans[2].analysisId, scans[1].analysisId])
    expect(Number(parsed.data[0].fundamental_fraction)).toBe(scans[2].fraction)
    expect(parsed.data[0].created_at).toBe(scans[2].at.toISOString())
    // A note that a spreadsheet would run as a formula is prefixed with a quote (OWASP CSV injection advice, common practice).
    expect(parsed.data[1].note).toBe(`'=SUM(A1) "quoted", and a comma`)
    expect((await get(viewer, `/api/cavities/00000000-0000-4000-8000-000000000000/history.csv`)).status).toBe(404)
  })

  it('when a lead opens the overview then every active cavity shows its latest figures, 30-day change, sparkline and target status', async () => {
    await request(server.url).put(`/api/cavities/${cavityId}/watch`).set('Authorization', lead.authorization)
    const entry = await request(server.url)
      .post(`/api/cavities/${cavityId}/log-entries`)
      .set('Authorization', lead.authorization)
      .send({ occurredAt: new Date(now - 5 * DAY_MS).toISOString(), kind: 'realignment', text: 'Walked the beam' })
    expect(entry.status).toBe(201)

    const response = await get(lead, '/api/overview')
    expect(response.status).toBe(200)
    expect(response.body.windowDays).toBe(30)
    expect(response.body.cavities.map((row: { name: string }) => row.name)).toEqual(['Overview empty cavity', 'Overview main cavity'])
    const [empty, main] = response.body.cavities
    expect(main).toMatchObject({
      cavityId,
      latest: { analysisId: scans[2].analysisId, fundamentalFraction: scans[2].fraction },
      targetFundamentalFraction: 0.7,
      targetStatus: scans[2].fraction >= 0.7 ? 'met' : 'below',
      activeAlerts: [],
      lastMaintenance: { entryId: entry.body.entry.id, kind: 'realignment', kindLabel: 'Realignment' },
      watchedByMe: true,
    })
    expect(main.targetStatus).toBe('met') // made with 85 % in TEM00
    // The 40-day-old scan is the reference for the 30-day change; the sparkline holds the last 30 days only.
    expect(main.fractionChange30d).toBeCloseTo(scans[2].fraction - scans[0].fraction, 12)
    expect(main.sparkline).toEqual([
      { t: scans[1].at.toISOString(), fundamentalFraction: scans[1].fraction },
      { t: scans[2].at.toISOString(), fundamentalFraction: scans[2].fraction },
    ])
    expect(empty).toMatchObject({ latest: null, fractionChange30d: null, sparkline: [], targetStatus: 'none', lastMaintenance: null, watchedByMe: false })
    expect((await get(viewer, '/api/overview')).body.cavities[1].watchedByMe).toBe(false)
  })

  it('when the overview is exported as CSV then there is one line per active cavity', async () => {
    const response = await get(viewer, '/api/overview.csv')
    expect(response.status).toBe(200)
    expect(response.headers['content-type']).toMatch(/^text\/csv/)
    const parsed = Papa.parse<Record<string, string>>(response.text, { header: true, skipEmptyLines: true })
    expect(parsed.data.map((row) => row.cavity)).toEqual(['Overview empty cavity', 'Overview main cavity'])
    const main = parsed.data[1]
    expect(Number(main.fundamental_fraction)).toBe(scans[2].fraction)
    expect(main.target_status).toBe('met')
    expect(main.last_maintenance_kind).toBe('Realignment')
    expect(main.analyses_30d).toBe('2')
    expect(parsed.data[0].fundamental_fraction).toBe('')
  })

  it('when two analyses are compared then both sets of figures and b − a come back', async () => {
    const [a, , b] = scans
    const response = await get(viewer, `/api/analyses/compare?a=${a.analysisId}&b=${b.analysisId}`)
    expect(response.status).toBe(200)
    const { body } = response
    const resultA = (await get(viewer, `/api/analyses/${a.analysisId}`)).body.result
    const resultB = (await get(viewer, `/api/analyses/${b.analysisId}`)).body.result
    expect(body.a).toMatchObject({ analysisId: a.analysisId, cavityName: 'Overview main cavity', fileName: 'scan-1.csv', fundamentalFraction: resultA.fundamentalFraction, orders: resultA.orders })
    expect(body.b).toMatchObject({ analysisId: b.analysisId, note: 'after walking the beam', finesse: resultB.finesse, fsrHz: resultB.fsr.hz })
    expect(body.difference.fundamentalFraction).toBeCloseTo(resultB.fundamentalFraction - resultA.fundamentalFraction, 12)
    expect(body.difference.finesse).toBeCloseTo(resultB.finesse - resultA.finesse, 9)
    expect(body.difference.linewidthHz).toBeCloseTo(resultB.linewidthHz - resultA.linewidthHz, 3)
    expect(body.difference.relative.finesse).toBeCloseTo((resultB.finesse - resultA.finesse) / resultA.finesse, 12)
    expect(body.difference.fsrHz).toBe(0) // same cavity, same geometry
    for (const order of new Set([...Object.keys(resultA.orders), ...Object.keys(resultB.orders)])) {
      expect(body.difference.orders[order]).toBeCloseTo((resultB.orders[order] ?? 0) - (resultA.orders[order] ?? 0), 12)
    }
    // The reported shares and the share below the noise of each side sum to 1 (the result schema's promise), so
    // their differences sum to 0.
    expect(body.difference.belowNoiseShare).toBeCloseTo(resultB.belowNoiseShare - resultA.belowNoiseShare, 12)
    const sum = Object.values(body.difference.orders as Record<string, number>).reduce((total, value) => total + value, 0)
    expect(sum + body.difference.belowNoiseShare).toBeCloseTo(0, 9)
  })

  it('when a comparison names a failed, unknown or missing analysis then it is refused with the reason', async () => {
    const failed = await get(viewer, `/api/analyses/compare?a=${scans[0].analysisId}&b=${failedAnalysisId}`)
    expect(failed.status).toBe(409)
    expect(failed.body.error.code).toBe('analysis_not_done')
    const unknown = await get(viewer, `/api/analyses/compare?a=${scans[0].analysisId}&b=00000000-0000-4000-8000-000000000000`)
    expect(unknown.status).toBe(404)
    const missing = await get(viewer, `/api/analyses/compare?a=${scans[0].analysisId}`)
    expect(missing.status).toBe(400)
    expect(missing.body.error.message).toContain('b')
    expect((await request(server.url).get(`/api/analyses/compare?a=${scans[0].analysisId}&b=${scans[1].analysisId}`)).status).toBe(401)
  })

  it('when a cavity whose name sorts first is added then every other cavity keeps its chart colour slot', async () => {
    const slots = async () => new Map(((await get(viewer, '/api/overview')).body.cavities as Array<{ cavityId: string; colourSlot: number }>).map((row) => [row.cavityId, row.colourSlot]))
    const before = await slots()
    const added = await request(server.url).post('/api/cavities').set('Authorization', lead.authorization).send({ name: 'AAA first by name', ...testCavityGeometry })
    expect(added.status).toBe(201)
    const after = await slots()
    for (const [id, slot] of before) expect(after.get(id)).toBe(slot)
    expect(after.get(added.body.cavity.id)).toBe(Math.max(...before.values(), 0) + 2) // the archived cavity keeps its slot too
  })
})

/**
 * The maintenance log (issue 7): kinds, entries with linked and uploaded traces, figures of the
 * nearest analyses around an entry, search and filters, and who may change what.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createActor, type TestActor } from '../support/actors'
import { generatedTraceCsv, testCavityGeometry } from '../support/traceFiles'
import { startTestServer, type TestServer } from '../support/testServer'

/** Wait until every analysis is done or failed (read straight from the database). */
async function analysesFinished(server: TestServer, ids: string[], timeoutMs = 30_000): Promise<void> {
  const deadline = Date.now() + timeoutMs
  for (;;) {
    const rows = (await server.db('analyses').whereIn('id', ids).select('status')) as Array<{ status: string }>
    if (rows.length === ids.length && rows.every((row) => row.status === 'done' || row.status === 'failed')) return
    if (Date.now() > deadline) throw new Error(`analyses ${ids.join(', ')} not finished after ${timeoutMs} ms`)
    await new Promise((resolve) => setTimeout(resolve, 100))
  }
}

describe('the maintenance log', () => {
  let server: TestServer
  let lead: TestActor
  let technician: TestActor
  let otherTechnician: TestActor
  let experimenter: TestActor
  let viewer: TestActor
  let cavityId: string
  let otherCavityId: string
  /** Analyses made before and after the cleaning entry, by upload. */
  const before = { traceId: '', analysisId: '', fraction: 0 }
  const after = { traceId: '', analysisId: '', fraction: 0 }
  let cleaningId: string

  const as = (actor: TestActor) => ({
    get: (path: string) => request(server.url).get(path).set('Authorization', actor.authorization),
    post: (path: string) => request(server.url).post(path).set('Authorization', actor.authorization),
    patch: (path: string) => request(server.url).patch(path).set('Authorization', actor.authorization),
    delete: (path: string) => request(server.url).delete(path).set('Authorization', actor.authorization),
  })

  async function upload(actor: TestActor, cavity: string, csv: string, name: string) {
    const response = await as(actor).post(`/api/cavities/${cavity}/traces`).attach('file', Buffer.from(csv), name)
    expect(response.status).toBe(202)
    const { trace, analysis } = response.body.uploads[0]
    await analysesFinished(server, [analysis.id])
    const done = await as(actor).get(`/api/analyses/${analysis.id}`)
    expect(done.body.status).toBe('done')
    return { traceId: trace.id as string, analysisId: analysis.id as string, fraction: done.body.result.fundamentalFraction as number }
  }

  beforeAll(async () => {
    server = await startTestServer()
    lead = await createActor(server.db, 'lead')
    technician = await createActor(server.db, 'technician')
    otherTechnician = await createActor(server.db, 'technician')
    experimenter = await createActor(server.db, 'experimenter')
    viewer = await createActor(server.db, 'viewer')
    for (const name of ['Logbook test cavity', 'Logbook other cavity']) {
      const created = await as(lead).post('/api/cavities').send({ name, ...testCavityGeometry })
      expect(created.status).toBe(201)
      if (name.includes('test')) cavityId = created.body.cavity.id
      else otherCavityId = created.body.cavity.id
    }
    Object.assign(before, await upload(technician, cavityId, generatedTraceCsv({ orderPowers: [0.6, 0.25, 0.1, 0.05], seed: 21 }), 'before-cleaning.csv'))
  })
  afterAll(() => server?.close())

  it('when the kinds are listed then the six built-in kinds come in order, and only leads and admins add one', async () => {
    const listed = await as(viewer).get('/api/log-kinds')
    expect(listed.status).toBe(200)
    expect(listed.body.kinds.map((kind: { key: string }) => kind.key)).toEqual(['cleaning', 'realignment', 'mirror_change', 'lens_change', 'inspection', 'other'])

    expect((await as(technician).post('/api/log-kinds').send({ label: 'Piezo check' })).status).toBe(403)
    const added = await as(lead).post('/api/log-kinds').send({ label: 'Piezo check' })
    expect(added.status).toBe(201)
    expect(added.body.kind).toEqual({ key: 'piezo_check', label: 'Piezo check', builtIn: false })
    const again = await as(lead).post('/api/log-kinds').send({ label: 'piezo CHECK' })
    expect(again.status).toBe(409)
    expect(again.body.error.code).toBe('kind_exists')
    expect((await as(viewer).get('/api/log-kinds')).body.kinds.at(-1).key).toBe('piezo_check')
  })

  it('when a technician writes an entry linking a trace then it reads back with author, kind label and the trace', async () => {
    const occurredAt = new Date().toISOString()
    const created = await as(technician)
      .post(`/api/cavities/${cavityId}/log-entries`)
      .send({ occurredAt, kind: 'cleaning', text: 'Cleaned both mirrors with solvent and lens tissue (drag wipe).', traceIds: [before.traceId] })
    expect(created.status).toBe(201)
    const entry = created.body.entry
    cleaningId = entry.id
    expect(entry).toMatchObject({ cavityId, occurredAt, kind: 'cleaning', kindLabel: 'Cleaning', author: { id: technician.id } })
    expect(entry.author.name).toMatch(/Test technician/)
    expect(entry.traces).toHaveLength(1)
    expect(entry.traces[0]).toMatchObject({ id: before.traceId, fileName: 'before-cleaning.csv', analysis: { id: before.analysisId, status: 'done' } })

    const read = await as(viewer).get(`/api/log-entries/${entry.id}`)
    expect(read.status).toBe(200)
    expect(read.body.entry.text).toContain('drag wipe')
  })

  it('when an entry names an unknown kind or a trace of another cavity then it is refused with the reason', async () => {
    const unknown = await as(technician).post(`/api/cavities/${cavityId}/log-entries`).send({ kind: 'polishing', text: 'x' })
    expect(unknown.status).toBe(400)
    expect(unknown.body.error.code).toBe('unknown_kind')
    expect(unknown.body.error.message).toContain('cleaning')

    const foreign = await upload(technician, otherCavityId, generatedTraceCsv({ seed: 22 }), 'other.csv')
    const refused = await as(technician).post(`/api/cavities/${cavityId}/log-entries`).send({ kind: 'inspection', traceIds: [foreign.traceId] })
    expect(refused.status).toBe(422)
    expect(refused.body.error.code).toBe('trace_not_of_cavity')

    const badDate = await as(technician).post(`/api/cavities/${cavityId}/log-entries`).send({ kind: 'inspection', occurredAt: 'yesterday-ish' })
    expect(badDate.status).toBe(400)
    expect(badDate.body.error.message).toContain('occurredAt')
  })

  it('when a trace is uploaded from the entry then it is stored for the cavity, analysed and attached', async () => {
    const response = await as(technician)
      .post(`/api/log-entries/${cleaningId}/traces`)
      .field('note', 'first scan after cleaning')
      .attach('file', Buffer.from(generatedTraceCsv({ orderPowers: [0.85, 0.08, 0.05, 0.02], seed: 23 })), 'after-cleaning.csv')
    expect(response.status).toBe(202)
    const [uploaded] = response.body.uploads
    expect(uploaded.trace.cavityId).toBe(cavityId)
    expect(uploaded.trace.note).toBe('first scan after cleaning')
    expect(response.body.entry.traces.map((trace: { id: string }) => trace.id)).toEqual([before.traceId, uploaded.trace.id])

    await analysesFinished(server, [uploaded.analysis.id])
    const done = await as(viewer).get(`/api/analyses/${uploaded.analysis.id}`)
    Object.assign(after, { traceId: uploaded.trace.id, analysisId: uploaded.analysis.id, fraction: done.body.result.fundamentalFraction })
    const history = await as(viewer).get(`/api/cavities/${cavityId}/history`)
    expect(history.body.analyses.map((row: { traceId: string }) => row.traceId)).toContain(uploaded.trace.id)

    const empty = await as(technician).post(`/api/log-entries/${cleaningId}/traces`).send({})
    expect(empty.status).toBe(400)
    expect(empty.body.error.code).toBe('no_file')
  })

  it('when an entry lies between two analyses then it shows their figures and the change across it', async () => {
    const { entry } = (await as(viewer).get(`/api/log-entries/${cleaningId}`)).body
    expect(entry.beforeAfter.before).toMatchObject({ analysisId: before.analysisId, fundamentalFraction: before.fraction })
    expect(entry.beforeAfter.after).toMatchObject({ analysisId: after.analysisId, fundamentalFraction: after.fraction })
    // The generated traces were made with 60 % and 85 % in TEM00 (tests/support/traceFiles.ts).
    expect(before.fraction).toBeGreaterThan(0.5)
    expect(after.fraction).toBeGreaterThan(0.75)
    expect(entry.beforeAfter.change.fundamentalFraction).toBeCloseTo(after.fraction - before.fraction, 12)
    expect(entry.beforeAfter.change.finesse).toBeCloseTo(entry.beforeAfter.after.finesse - entry.beforeAfter.before.finesse, 9)
    expect(entry.beforeAfter.change.linewidthHz).toBeCloseTo(entry.beforeAfter.after.linewidthHz - entry.beforeAfter.before.linewidthHz, 3)

    // An entry before every analysis has nothing before it.
    const early = await as(technician).post(`/api/cavities/${cavityId}/log-entries`).send({ occurredAt: '2026-01-05T09:00:00Z', kind: 'inspection', text: 'Incoming inspection of the spacer' })
    expect(early.body.entry.beforeAfter.before).toBeNull()
    expect(early.body.entry.beforeAfter.after.analysisId).toBe(before.analysisId)
    expect(early.body.entry.beforeAfter.change.fundamentalFraction).toBeNull()
  })

  it('when the list is searched and filtered then only matching entries come back, newest first', async () => {
    await as(lead).post(`/api/cavities/${cavityId}/log-entries`).send({ occurredAt: '2026-03-10T12:00:00Z', kind: 'realignment', text: 'Walked the beam, 50% more in TEM00' })
    const all = (await as(viewer).get(`/api/cavities/${cavityId}/log-entries`)).body.entries as Array<{ occurredAt: string; kind: string }>
    expect(all.length).toBeGreaterThanOrEqual(3)
    const times = all.map((entry) => Date.parse(entry.occurredAt))
    expect([...times].sort((a, b) => b - a)).toEqual(times)

    const search = async (query: string) => ((await as(viewer).get(`/api/cavities/${cavityId}/log-entries?${query}`)).body.entries as Array<{ kind: string; text: string }>)
    expect((await search('q=SOLVENT')).map((entry) => entry.kind)).toEqual(['cleaning'])
    // LIKE wildcards in the search are literal: "50%" matches only the text holding "50%".
    expect((await search('q=50%25')).map((entry) => entry.kind)).toEqual(['realignment'])
    expect((await search('q=%25%25%25')).length).toBe(0)
    expect((await search('kind=inspection,realignment')).map((entry) => entry.kind).sort()).toEqual(['inspection', 'realignment'])
    expect((await search('from=2026-03-01&to=2026-03-31')).map((entry) => entry.kind)).toEqual(['realignment'])
    expect((await search('to=2026-02-01')).map((entry) => entry.kind)).toEqual(['inspection'])
    const bad = await as(viewer).get(`/api/cavities/${cavityId}/log-entries?from=not-a-date`)
    expect(bad.status).toBe(400)
  })

  it('when someone else edits an entry then only a lead or admin may; the author may edit and delete it', async () => {
    const path = `/api/log-entries/${cleaningId}`
    const stranger = await as(otherTechnician).patch(path).send({ text: 'not mine' })
    expect(stranger.status).toBe(403)
    expect(stranger.body.error.code).toBe('not_author')
    expect((await as(experimenter).patch(path).send({ text: 'no logbook permission' })).status).toBe(403)
    expect((await as(viewer).post(`/api/cavities/${cavityId}/log-entries`).send({ kind: 'other' })).status).toBe(403)

    const byLead = await as(lead).patch(path).send({ kind: 'mirror_change', traceIds: [after.traceId] })
    expect(byLead.status).toBe(200)
    expect(byLead.body.entry.kindLabel).toBe('Mirror change')
    expect(byLead.body.entry.traces.map((trace: { id: string }) => trace.id)).toEqual([after.traceId])
    expect(byLead.body.entry.author.id).toBe(technician.id)

    const byAuthor = await as(technician).patch(path).send({ text: 'Changed the input mirror after cleaning did not help.' })
    expect(byAuthor.status).toBe(200)
    expect(byAuthor.body.entry.text).toMatch(/^Changed the input mirror/)

    expect((await as(otherTechnician).delete(path)).status).toBe(403)
    expect((await as(technician).delete(path)).status).toBe(204)
    expect((await as(viewer).get(path)).status).toBe(404)
    // The traces stay with the cavity.
    expect((await as(viewer).get(`/api/traces/${after.traceId}`)).status).toBe(200)
  })
})

/**
 * The lab-wide list (`GET /api/log-entries`): every cavity's entries in one call, with the filters of a
 * cavity's list plus `cavityId`. Order, limit and the archived rule are the route's documented contract
 * (server/logbook/logbookRoutes.ts); the archived rule copies `GET /api/cavities`. Invented cavities and text.
 */
describe('the lab-wide maintenance log', () => {
  let server: TestServer
  let lead: TestActor
  let viewer: TestActor
  const cavity = { north: '', south: '', shelved: '' }
  const names = { north: 'Lab-wide north cavity', south: 'Lab-wide south cavity', shelved: 'Lab-wide shelved cavity' }

  const get = (path: string) => request(server.url).get(path).set('Authorization', viewer.authorization)
  type Listed = { id: string; cavityId: string; cavityName: string; occurredAt: string; kind: string; text: string; traces: unknown[]; beforeAfter: unknown }
  const list = async (query = '') => {
    const response = await get(`/api/log-entries${query ? `?${query}` : ''}`)
    expect(response.status, JSON.stringify(response.body)).toBe(200)
    return response.body.entries as Listed[]
  }
  const texts = (entries: Listed[]) => entries.map((entry) => entry.text)

  async function write(cavityId: string, occurredAt: string, kind: string, text: string): Promise<string> {
    const created = await request(server.url).post(`/api/cavities/${cavityId}/log-entries`).set('Authorization', lead.authorization).send({ occurredAt, kind, text })
    expect(created.status).toBe(201)
    return created.body.entry.id as string
  }

  beforeAll(async () => {
    server = await startTestServer()
    lead = await createActor(server.db, 'lead')
    viewer = await createActor(server.db, 'viewer')
    for (const key of ['north', 'south', 'shelved'] as const) {
      const created = await request(server.url).post('/api/cavities').set('Authorization', lead.authorization).send({ name: names[key], ...testCavityGeometry })
      expect(created.status).toBe(201)
      cavity[key] = created.body.cavity.id
    }
    await write(cavity.north, '2026-02-01T08:00:00Z', 'cleaning', 'north: wiped the input coupler')
    await write(cavity.south, '2026-03-01T08:00:00Z', 'inspection', 'south: dust on the output mirror')
    await write(cavity.north, '2026-04-01T08:00:00Z', 'realignment', 'north: walked the beam onto the waist')
    await write(cavity.south, '2026-05-01T08:00:00Z', 'mirror_change', 'south: swapped the output mirror')
    // Two entries for the same moment: the one written later comes first.
    await write(cavity.north, '2026-06-01T08:00:00Z', 'other', 'north: same moment, written first')
    await write(cavity.south, '2026-06-01T08:00:00Z', 'other', 'south: same moment, written second')
    await write(cavity.shelved, '2026-04-15T08:00:00Z', 'inspection', 'shelved: last look before storage')
    const archived = await request(server.url).patch(`/api/cavities/${cavity.shelved}`).set('Authorization', lead.authorization).send({ archived: true })
    expect(archived.status).toBe(200)
  })
  afterAll(() => server?.close())

  it('when the lab-wide list is read then both active cavities come back in one call, newest first, each entry naming its cavity', async () => {
    const entries = await list()
    expect(texts(entries)).toEqual([
      'south: same moment, written second',
      'north: same moment, written first',
      'south: swapped the output mirror',
      'north: walked the beam onto the waist',
      'south: dust on the output mirror',
      'north: wiped the input coupler',
    ])
    for (const entry of entries) {
      const key = entry.text.startsWith('north') ? 'north' : 'south'
      expect(entry).toMatchObject({ cavityId: cavity[key], cavityName: names[key], traces: [] })
      expect(entry.beforeAfter).toMatchObject({ before: null, after: null })
    }
    // The single entry and a cavity's own list carry the name too.
    const one = await get(`/api/log-entries/${entries[0].id}`)
    expect(one.status).toBe(200)
    expect(one.body.entry).toMatchObject({ id: entries[0].id, cavityName: names.south })
    const own = await get(`/api/cavities/${cavity.north}/log-entries`)
    expect(own.body.entries.map((entry: Listed) => entry.cavityName)).toEqual([names.north, names.north, names.north])
  })

  it('when archived cavities are asked for then their entries join the list, in date order', async () => {
    expect(texts(await list()).some((text) => text.startsWith('shelved'))).toBe(false)
    const withArchived = texts(await list('archived=true'))
    expect(withArchived).toHaveLength(7)
    expect(withArchived.indexOf('shelved: last look before storage')).toBe(withArchived.indexOf('north: walked the beam onto the waist') - 1)
    // A cavity picked by id counts whether archived or not, as its own list does.
    expect(texts(await list(`cavityId=${cavity.shelved}`))).toEqual(['shelved: last look before storage'])
  })

  it('when the lab-wide list is filtered by kind, text, dates, cavity and limit then only matching entries come back', async () => {
    expect(texts(await list('kind=cleaning,mirror_change'))).toEqual(['south: swapped the output mirror', 'north: wiped the input coupler'])
    expect(texts(await list('q=OUTPUT%20MIRROR'))).toEqual(['south: swapped the output mirror', 'south: dust on the output mirror'])
    // from/to are inclusive bounds on when the work happened.
    expect(texts(await list('from=2026-03-01T08:00:00Z&to=2026-04-01T08:00:00Z'))).toEqual(['north: walked the beam onto the waist', 'south: dust on the output mirror'])
    expect(texts(await list(`cavityId=${cavity.north}`))).toEqual(['north: same moment, written first', 'north: walked the beam onto the waist', 'north: wiped the input coupler'])
    expect(texts(await list(`cavityId=${cavity.south}&kind=inspection,other&q=mirror`))).toEqual(['south: dust on the output mirror'])
    // The limit counts the whole list, not each cavity.
    expect(texts(await list('limit=2'))).toEqual(['south: same moment, written second', 'north: same moment, written first'])
    expect(await list('q=nothing%20like%20this')).toEqual([])
  })

  it('when the cavity id is unknown then the answer is the same 404 as the cavity list gives', async () => {
    const unknown = '00000000-0000-4000-8000-000000000000'
    const lab = await get(`/api/log-entries?cavityId=${unknown}`)
    expect(lab.status).toBe(404)
    expect(lab.body.error.code).toBe('cavity_not_found')
    expect(lab.body.error.message).toContain(unknown)
    const own = await get(`/api/cavities/${unknown}/log-entries`)
    expect(own.status).toBe(404)
    expect(lab.body).toEqual(own.body)
  })

  it('when the query is malformed then the answer is 400 naming the field', async () => {
    for (const [query, field] of [
      ['cavityId=north', 'cavityId'],
      ['from=not-a-date', 'from'],
      ['to=2026-13-45', 'to'],
      ['limit=0', 'limit'],
      ['limit=5000', 'limit'],
      ['archived=yes', 'archived'],
    ]) {
      const response = await get(`/api/log-entries?${query}`)
      expect(response.status, query).toBe(400)
      expect(response.body.error.code, query).toBe('invalid_input')
      expect(response.body.error.message, query).toContain(`${field}:`)
    }
  })

  it('when nobody is signed in then the lab-wide list is refused', async () => {
    const response = await request(server.url).get('/api/log-entries')
    expect(response.status).toBe(401)
  })
})

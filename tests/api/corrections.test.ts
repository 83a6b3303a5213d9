/**
 * Undoing a wrong upload (issue 13): exclude an analysis with a reason, move a trace to the cavity it belongs to
 * (analysed again there), delete a trace and restore it within 30 days; who may do each; the audit log; alerts that
 * a wrong upload raised are cleared; the fit check that says a trace belongs to another geometry. Invented data.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { purgeDeletedTraces } from '../../server/corrections/correctionRepository'
import { createActor, type TestActor } from '../support/actors'
import { generatedTraceCsv, testCavityGeometry } from '../support/traceFiles'
import { startTestServer, type TestServer } from '../support/testServer'

/** A plano-concave cavity 30 % longer than the test cavity: its Gouy phase is 0.535 rad against 0.464 rad. */
const longerGeometry = { ...testCavityGeometry, lengthMm: 130 }

describe('undoing a wrong upload', () => {
  let server: TestServer
  let experimenter: TestActor
  let otherExperimenter: TestActor
  let lead: TestActor
  let admin: TestActor
  let viewer: TestActor
  let cavityId: string
  let longerCavityId: string
  let seed = 300

  const as = (actor: TestActor) => ({
    get: (path: string) => request(server.url).get(path).set('Authorization', actor.authorization),
    post: (path: string) => request(server.url).post(path).set('Authorization', actor.authorization),
    put: (path: string) => request(server.url).put(path).set('Authorization', actor.authorization),
    delete: (path: string) => request(server.url).delete(path).set('Authorization', actor.authorization),
  })

  async function waitForAnalysis(id: string) {
    const deadline = Date.now() + 30_000
    for (;;) {
      const response = await as(lead).get(`/api/analyses/${id}`)
      expect(response.status).toBe(200)
      if (response.body.status === 'done' || response.body.status === 'failed') return response.body
      if (Date.now() > deadline) throw new Error(`analysis ${id} still ${response.body.status}`)
      await new Promise((resolve) => setTimeout(resolve, 100))
    }
  }

  /** Upload a generated trace as `actor` and wait for its analysis; returns trace and analysis ids. */
  async function upload(actor: TestActor, toCavity: string, overrides: Parameters<typeof generatedTraceCsv>[0] = {}) {
    seed += 1
    const response = await as(actor).post(`/api/cavities/${toCavity}/traces`).attach('file', Buffer.from(generatedTraceCsv({ seed, ...overrides })), `scan-${seed}.csv`)
    expect(response.status).toBe(202)
    const analysisId: string = response.body.uploads[0].analysis.id
    const done = await waitForAnalysis(analysisId)
    expect(done.status).toBe('done')
    return { traceId: response.body.uploads[0].trace.id as string, analysisId, result: done.result }
  }

  const historyOf = async (id: string) => (await as(lead).get(`/api/cavities/${id}/history`)).body.analyses as Array<{ analysisId: string; traceId: string; doubt: string | null; excluded: { reason: string } | null; fundamentalFractionError: number | null }>
  const alertState = async (id: string, kind: string) => ((await as(lead).get(`/api/cavities/${id}/alerts`)).body.states as Array<{ kind: string; breached: boolean }>).find((s) => s.kind === kind)
  /** The alert check runs just after an analysis is marked done, so wait for its verdict rather than race it. */
  async function breachedSoon(id: string, kind: string, expected: boolean) {
    const deadline = Date.now() + 15_000
    while ((await alertState(id, kind))?.breached !== expected) {
      if (Date.now() > deadline) throw new Error(`${kind} of ${id} never became ${expected}`)
      await new Promise((resolve) => setTimeout(resolve, 100))
    }
  }
  const auditEvents = async () => ((await as(admin).get('/api/audit?limit=200')).body.events as Array<{ event: string; details: Record<string, unknown> }>)

  beforeAll(async () => {
    server = await startTestServer()
    ;[experimenter, otherExperimenter, lead, admin, viewer] = await Promise.all([
      createActor(server.db, 'experimenter'),
      createActor(server.db, 'experimenter'),
      createActor(server.db, 'lead'),
      createActor(server.db, 'admin'),
      createActor(server.db, 'viewer'),
    ])
    const first = await as(lead).post('/api/cavities').send({ name: 'Undo test cavity', ...testCavityGeometry })
    const second = await as(lead).post('/api/cavities').send({ name: 'Undo longer cavity', ...longerGeometry })
    expect([first.status, second.status]).toEqual([201, 201])
    cavityId = first.body.cavity.id
    longerCavityId = second.body.cavity.id
    // Four good scans: the newest has three before it, enough to judge a finesse drop against their median.
    for (let i = 0; i < 4; i++) await upload(experimenter, cavityId)
    expect((await as(lead).put(`/api/cavities/${cavityId}/alerts`).send({ targetFundamentalFraction: null, finesseDropPercent: 30 })).status).toBe(200)
  })
  afterAll(() => server?.close())

  it('when history rows are listed then each carries its stated error, and a trusted one no doubt', async () => {
    const rows = await historyOf(cavityId)
    expect(rows).toHaveLength(4)
    for (const row of rows) {
      expect(row.fundamentalFractionError).toBeGreaterThan(0)
      expect(row.doubt).toBeNull()
    }
  })

  it('when a trace of the longer cavity is dropped on this one then it is in doubt, the fit check names both Gouy phases and offers the longer cavity, and a move re-analyses it there', async () => {
    const wrong = await upload(experimenter, cavityId, { cavity: longerGeometry })
    expect(wrong.result.warnings.map((w: { code: string }) => w.code)).toContain('geometry_mismatch')
    const row = (await historyOf(cavityId)).find((r) => r.analysisId === wrong.analysisId)!
    expect(row.doubt).toMatch(/^In doubt: .*cavity geometry/)

    const check = await as(viewer).get(`/api/analyses/${wrong.analysisId}/fit-check`)
    expect(check.status).toBe(200)
    expect(check.body.fitCheck.mismatch).toBe(true)
    expect(check.body.fitCheck.message).toMatch(/^This trace does not look like Undo test cavity \(measured Gouy phase 0\.53\d rad, expected 0\.464 rad\)\.$/)
    expect(check.body.fitCheck.candidates[0]).toMatchObject({ cavityId: longerCavityId, name: 'Undo longer cavity' })
    // A trace that belongs here passes the same check.
    const good = (await historyOf(cavityId)).find((r) => r.analysisId !== wrong.analysisId)!
    expect((await as(viewer).get(`/api/analyses/${good.analysisId}/fit-check`)).body.fitCheck).toMatchObject({ mismatch: false, message: null, candidates: [] })

    // Only the uploader (or a lead or admin) may move it; a viewer has no such permission at all.
    expect((await as(otherExperimenter).post(`/api/traces/${wrong.traceId}/move`).send({ cavityId: longerCavityId })).status).toBe(403)
    expect((await as(viewer).post(`/api/traces/${wrong.traceId}/move`).send({ cavityId: longerCavityId })).status).toBe(403)
    expect((await as(experimenter).post(`/api/traces/${wrong.traceId}/move`).send({ cavityId: cavityId })).status).toBe(409)
    const moved = await as(experimenter).post(`/api/traces/${wrong.traceId}/move`).send({ cavityId: longerCavityId, reason: 'dropped on the wrong cavity' })
    expect(moved.status).toBe(202)
    expect(moved.body.trace.cavityId).toBe(longerCavityId)
    const again = await waitForAnalysis(moved.body.analysis.id)
    expect(again.status).toBe('done')
    expect(again.geometry.lengthMm).toBe(130)
    expect(again.result.warnings.map((w: { code: string }) => w.code)).not.toContain('geometry_mismatch')

    expect((await historyOf(cavityId)).some((r) => r.traceId === wrong.traceId)).toBe(false)
    const there = await historyOf(longerCavityId)
    expect(there.find((r) => r.analysisId === moved.body.analysis.id)?.excluded).toBeNull()
    // The old reading moved with the trace, excluded with the reason it no longer counts.
    expect(there.find((r) => r.analysisId === wrong.analysisId)?.excluded?.reason).toMatch(/Read as "Undo test cavity" before the trace was moved/)
    expect((await auditEvents()).find((e) => e.event === 'trace.moved')?.details).toMatchObject({ traceId: wrong.traceId, from: cavityId, to: longerCavityId, reason: 'dropped on the wrong cavity' })
  })

  it('when a wrong upload fires the finesse alert then excluding it with a reason clears the alert, and including it again raises it', async () => {
    const dirty = await upload(experimenter, cavityId, { finesse: 150 })
    await breachedSoon(cavityId, 'finesse_drop', true)

    expect((await as(experimenter).put(`/api/analyses/${dirty.analysisId}/exclusion`).send({ reason: '' })).status).toBe(400)
    expect((await as(otherExperimenter).put(`/api/analyses/${dirty.analysisId}/exclusion`).send({ reason: 'not mine' })).status).toBe(403)
    const excluded = await as(experimenter).put(`/api/analyses/${dirty.analysisId}/exclusion`).send({ reason: 'scope on the wrong channel' })
    expect(excluded.status).toBe(200)
    expect(excluded.body.analysis.excluded).toMatchObject({ reason: 'scope on the wrong channel' })
    expect((await alertState(cavityId, 'finesse_drop'))?.breached).toBe(false)
    expect((await historyOf(cavityId)).find((r) => r.analysisId === dirty.analysisId)?.excluded).toEqual({ reason: 'scope on the wrong channel' })
    // Left out of the overview's latest figures too.
    const overview = (await as(viewer).get('/api/overview')).body.cavities.find((c: { cavityId: string }) => c.cavityId === cavityId)
    expect(overview.latest.analysisId).not.toBe(dirty.analysisId)

    const included = await as(lead).delete(`/api/analyses/${dirty.analysisId}/exclusion`)
    expect(included.status).toBe(200)
    expect(included.body.analysis.excluded).toBeNull()
    expect((await alertState(cavityId, 'finesse_drop'))?.breached).toBe(true)
    const events = (await auditEvents()).map((e) => e.event)
    expect(events).toContain('analysis.excluded')
    expect(events).toContain('analysis.included')
  })

  it('when a lead deletes someone else’s trace then it leaves history and alerts, an admin restores it, and after 30 days it cannot be restored and is purged', async () => {
    const newest = (await historyOf(cavityId))[0]
    expect((await as(otherExperimenter).delete(`/api/traces/${newest.traceId}`)).status).toBe(403)
    const deleted = await as(lead).delete(`/api/traces/${newest.traceId}`).send({ reason: 'test upload' })
    expect(deleted.status).toBe(200)
    expect(Date.parse(deleted.body.restoreUntil) - Date.now()).toBeGreaterThan(29 * 86_400_000)
    expect((await historyOf(cavityId)).some((r) => r.traceId === newest.traceId)).toBe(false)
    expect((await as(viewer).get(`/api/analyses/${newest.analysisId}`)).body.error.code).toBe('analysis_deleted')
    expect((await as(viewer).get(`/api/traces/${newest.traceId}`)).status).toBe(404)
    // The finesse alert that trace raised is judged again on the newest remaining analysis.
    expect((await alertState(cavityId, 'finesse_drop'))?.breached).toBe(false)

    expect((await as(lead).get('/api/deleted-traces')).status).toBe(403)
    const listed = await as(admin).get('/api/deleted-traces')
    expect(listed.body.traces.find((t: { id: string }) => t.id === newest.traceId)).toMatchObject({ cavityId, reason: 'test upload' })
    expect((await as(lead).post(`/api/traces/${newest.traceId}/restore`)).status).toBe(403)
    const restored = await as(admin).post(`/api/traces/${newest.traceId}/restore`)
    expect(restored.status).toBe(200)
    expect((await historyOf(cavityId)).some((r) => r.traceId === newest.traceId)).toBe(true)
    expect((await as(admin).post(`/api/traces/${newest.traceId}/restore`)).status).toBe(404)

    expect((await as(lead).delete(`/api/traces/${newest.traceId}`)).status).toBe(200)
    await server.db('traces').where({ id: newest.traceId }).update({ deleted_at: new Date(Date.now() - 31 * 86_400_000) })
    const late = await as(admin).post(`/api/traces/${newest.traceId}/restore`)
    expect(late.status).toBe(410)
    expect(late.body.error.message).toMatch(/more than 30 days ago/)
    expect((await as(admin).get('/api/deleted-traces')).body.traces.some((t: { id: string }) => t.id === newest.traceId)).toBe(false)
    expect(await purgeDeletedTraces(server.db)).toBe(1)
    expect(await server.db('analyses').where({ trace_id: newest.traceId }).count('* as n').first()).toMatchObject({ n: '0' })
    const events = (await auditEvents()).map((e) => e.event)
    expect(events.filter((e) => e === 'trace.deleted')).toHaveLength(2)
    expect(events).toContain('trace.restored')
  })

  it('when the same file is uploaded again after it was deleted then it is a fresh upload, not a link to the deleted one', async () => {
    seed += 1
    const csv = Buffer.from(generatedTraceCsv({ seed }))
    const first = await as(experimenter).post(`/api/cavities/${cavityId}/traces`).attach('file', csv, 'again.csv')
    await waitForAnalysis(first.body.uploads[0].analysis.id)
    expect((await as(experimenter).delete(`/api/traces/${first.body.uploads[0].trace.id}`)).status).toBe(200)
    const second = await as(experimenter).post(`/api/cavities/${cavityId}/traces`).attach('file', csv, 'again.csv')
    expect(second.status).toBe(202)
    expect(second.body.uploads[0].created).toBe(true)
    expect(second.body.uploads[0].trace.id).not.toBe(first.body.uploads[0].trace.id)
  })
})

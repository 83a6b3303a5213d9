/**
 * Roles of issue 13: an experimenter proposes a cavity, which stays out of the lists and takes no uploads until a
 * lead approves it; a lead can also turn it down; both are in the audit log. A technician saves a lens plan.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { insertLens } from '../../server/lenses/lensRepository'
import { createActor, type TestActor } from '../support/actors'
import { generatedTraceCsv, testCavityGeometry } from '../support/traceFiles'
import { startTestServer, type TestServer } from '../support/testServer'

describe('cavity proposals and plans saved by technicians', () => {
  let server: TestServer
  let experimenter: TestActor
  let technician: TestActor
  let lead: TestActor
  let admin: TestActor
  const as = (actor: TestActor) => ({
    get: (path: string) => request(server.url).get(path).set('Authorization', actor.authorization),
    post: (path: string) => request(server.url).post(path).set('Authorization', actor.authorization),
    delete: (path: string) => request(server.url).delete(path).set('Authorization', actor.authorization),
  })
  const names = async (path: string) => ((await as(experimenter).get(path)).body.cavities as Array<{ name: string }>).map((c) => c.name)

  beforeAll(async () => {
    server = await startTestServer()
    ;[experimenter, technician, lead, admin] = await Promise.all(['experimenter', 'technician', 'lead', 'admin'].map((role) => createActor(server.db, role as never)))
  })
  afterAll(() => server?.close())

  it('when an experimenter proposes a cavity then it waits outside the lists, refuses uploads, and a lead approves it', async () => {
    expect((await as(experimenter).post('/api/cavities').send({ name: 'Setup B cavity', ...testCavityGeometry })).status).toBe(403)
    expect((await as(technician).post('/api/cavity-proposals').send({ name: 'Setup B cavity', ...testCavityGeometry })).status).toBe(403)
    const proposed = await as(experimenter).post('/api/cavity-proposals').send({ name: 'Setup B cavity', ...testCavityGeometry })
    expect(proposed.status).toBe(201)
    expect(proposed.body.cavity).toMatchObject({ pending: true, proposedBy: experimenter.id })
    const id = proposed.body.cavity.id
    expect(await names('/api/cavities')).not.toContain('Setup B cavity')
    expect(await names('/api/cavity-proposals')).toEqual(['Setup B cavity'])
    const early = await as(experimenter).post(`/api/cavities/${id}/traces`).attach('file', Buffer.from(generatedTraceCsv({ seed: 71 })), 'early.csv')
    expect(early.status).toBe(409)
    expect(early.body.error.code).toBe('cavity_not_approved')

    expect((await as(experimenter).post(`/api/cavities/${id}/approve`)).status).toBe(403)
    const approved = await as(lead).post(`/api/cavities/${id}/approve`)
    expect(approved.status).toBe(200)
    expect(approved.body.cavity.pending).toBe(false)
    expect(await names('/api/cavities')).toContain('Setup B cavity')
    expect((await as(lead).post(`/api/cavities/${id}/approve`)).status).toBe(409)
    expect((await as(experimenter).post(`/api/cavities/${id}/traces`).attach('file', Buffer.from(generatedTraceCsv({ seed: 71 })), 'early.csv')).status).toBe(202)
  })

  it('when a lead turns a proposal down then it is gone, and the audit log has both decisions', async () => {
    const proposed = await as(experimenter).post('/api/cavity-proposals').send({ name: 'Setup C cavity', ...testCavityGeometry })
    expect((await as(lead).delete(`/api/cavity-proposals/${proposed.body.cavity.id}`)).status).toBe(204)
    expect((await as(lead).get(`/api/cavities/${proposed.body.cavity.id}`)).status).toBe(404)
    const events = ((await as(admin).get('/api/audit')).body.events as Array<{ event: string; subject: string }>).map((e) => `${e.event} ${e.subject}`)
    expect(events).toEqual(expect.arrayContaining(['cavity.proposed Setup B cavity', 'cavity.approved Setup B cavity', 'cavity.proposed Setup C cavity', 'cavity.rejected Setup C cavity']))
  })

  it('when a technician saves a lens plan then it is stored and the technician may delete it', async () => {
    const cavity = await as(lead).post('/api/cavities').send({ name: 'Plan cavity', ...testCavityGeometry })
    const lens = await insertLens(server.db, { label: 'tech-f150', focalLengthMm: 150, count: 1, type: 'plano-convex', wavelengthMinNm: null, wavelengthMaxNm: null, notes: '' })
    const inputs = { beam: { kind: 'waist', x: { waistRadiusMm: 0.3, waistPositionMm: 0 } }, table: { laserToCavityMm: 500, lensZonesMm: [[50, 200], [250, 400]], minSpacingMm: 10, positionStepMm: 5 } }
    const saved = await as(technician).post(`/api/cavities/${cavity.body.cavity.id}/plans`).send({ inputs, lenses: [{ lensId: lens.id, zMm: 120 }], note: 'from the kit' })
    expect(saved.status).toBe(201)
    expect((await as(experimenter).delete(`/api/plans/${saved.body.plan.id}`)).status).toBe(403)
    expect((await as(technician).delete(`/api/plans/${saved.body.plan.id}`)).status).toBe(204)
  })
})

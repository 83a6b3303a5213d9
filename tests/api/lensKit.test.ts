/**
 * The lab's lens kit (issue 8, item 3): add, edit, delete, who may do it, and the CSV export and import (round
 * trip, updates by label, every bad line named, nothing half-imported). The lenses are an invented lab's.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createActor, type TestActor } from '../support/actors'
import { startTestServer, type TestServer } from '../support/testServer'

describe('the lens kit', () => {
  let server: TestServer
  let technician: TestActor
  let experimenter: TestActor
  let viewer: TestActor

  const as = (actor: TestActor) => ({
    get: (path: string) => request(server.url).get(path).set('Authorization', actor.authorization),
    post: (path: string) => request(server.url).post(path).set('Authorization', actor.authorization),
    patch: (path: string) => request(server.url).patch(path).set('Authorization', actor.authorization),
    delete: (path: string) => request(server.url).delete(path).set('Authorization', actor.authorization),
  })

  beforeAll(async () => {
    server = await startTestServer()
    technician = await createActor(server.db, 'technician')
    experimenter = await createActor(server.db, 'experimenter')
    viewer = await createActor(server.db, 'viewer')
  })
  afterAll(() => server?.close())

  it('when a technician adds, edits and deletes a lens then the kit follows, and defaults are filled in', async () => {
    const added = await as(technician).post('/api/lenses').send({ label: 'T-150', focalLengthMm: 150 })
    expect(added.status, JSON.stringify(added.body)).toBe(201)
    expect(added.body.lens).toMatchObject({ label: 'T-150', focalLengthMm: 150, count: 1, type: 'plano-convex', wavelengthMinNm: null, wavelengthMaxNm: null, notes: '' })
    const id = added.body.lens.id as string

    const edited = await as(technician).patch(`/api/lenses/${id}`).send({ count: 3, wavelengthMinNm: 700, wavelengthMaxNm: 1100, notes: 'drawer 4' })
    expect(edited.status).toBe(200)
    expect(edited.body.lens).toMatchObject({ count: 3, wavelengthMinNm: 700, wavelengthMaxNm: 1100, notes: 'drawer 4', focalLengthMm: 150 })

    const listed = await as(viewer).get('/api/lenses')
    expect(listed.status).toBe(200)
    expect(listed.body.lenses.map((l: { label: string }) => l.label)).toContain('T-150')

    expect((await as(technician).delete(`/api/lenses/${id}`)).status).toBe(204)
    expect((await as(technician).delete(`/api/lenses/${id}`)).status).toBe(404)
  })

  it('when an experimenter or a viewer tries to change the kit then it is forbidden, naming the permission', async () => {
    for (const actor of [experimenter, viewer]) {
      const refused = await as(actor).post('/api/lenses').send({ label: 'X-1', focalLengthMm: 100 })
      expect(refused.status).toBe(403)
      expect(refused.body.error.message).toContain('lenses.write')
    }
  })

  it('when a lens is invalid then the answer names the field and the problem', async () => {
    const cases: [object, RegExp][] = [
      [{ label: 'Z-0', focalLengthMm: 0.2 }, /focalLengthMm must be at least 1 mm/],
      [{ label: '', focalLengthMm: 100 }, /label must not be empty/],
      [{ label: 'Z-1', focalLengthMm: 100, count: 1.5 }, /count must be a whole number/],
      [{ label: 'Z-2', focalLengthMm: 100, type: 'prism' }, /type must be one of/],
      [{ label: 'Z-3', focalLengthMm: 100, wavelengthMinNm: 1100, wavelengthMaxNm: 700 }, /wavelengthMinNm must not be larger than wavelengthMaxNm/],
    ]
    for (const [body, message] of cases) {
      const response = await as(technician).post('/api/lenses').send(body)
      expect(response.status, JSON.stringify(body)).toBe(400)
      expect(response.body.error.message).toMatch(message)
    }
    expect((await as(technician).post('/api/lenses').send({ label: 'DUP', focalLengthMm: 50 })).status).toBe(201)
    const again = await as(technician).post('/api/lenses').send({ label: 'DUP', focalLengthMm: 75 })
    expect(again.status).toBe(409)
    expect(again.body.error.message).toContain('"DUP"')
  })

  it('when the kit is exported and imported again then nothing changes, and every field survives (text with commas, quotes and a leading =)', async () => {
    await as(technician).post('/api/lenses').send({ label: 'RT-1', focalLengthMm: -75.5, count: 2, type: 'plano-concave', wavelengthMinNm: 650, wavelengthMaxNm: 1050, notes: 'left drawer, "spare"' })
    await as(technician).post('/api/lenses').send({ label: 'RT-2', focalLengthMm: 1000, count: 0, type: 'achromat', notes: '=SUM(A1) is not a formula here' })
    const before = (await as(viewer).get('/api/lenses')).body.lenses
    const exported = await as(viewer).get('/api/lenses.csv')
    expect(exported.status).toBe(200)
    expect(exported.headers['content-type']).toMatch(/text\/csv/)
    const csv = exported.text
    expect(csv.split('\n')[0]).toBe('label,focal_length_mm,count,type,wavelength_min_nm,wavelength_max_nm,notes')
    // A spreadsheet must not run the note as a formula (common practice: prefix the cell with ').
    expect(csv).toContain("'=SUM(A1)")

    const imported = await as(technician).post('/api/lenses/import').set('Content-Type', 'text/csv').send(csv)
    expect(imported.status, JSON.stringify(imported.body)).toBe(200)
    expect(imported.body).toMatchObject({ created: 0, updated: before.length })
    const strip = (lenses: Array<Record<string, unknown>>) => lenses.map(({ updatedAt: _u, createdAt: _c, ...rest }) => rest)
    expect(strip(imported.body.lenses)).toEqual(strip(before))
  })

  it('when a CSV file is uploaded then new labels are added and known labels updated', async () => {
    const csv = 'Label,Focal length (mm),Count,Type\nUP-1,40,2,bi-convex\nRT-1,-75.5,5,plano-concave\n'
    const response = await as(technician).post('/api/lenses/import').attach('file', Buffer.from(csv), 'kit.csv')
    expect(response.status, JSON.stringify(response.body)).toBe(200)
    expect(response.body).toMatchObject({ created: 1, updated: 1 })
    const byLabel = new Map(response.body.lenses.map((l: { label: string }) => [l.label, l]))
    expect(byLabel.get('UP-1')).toMatchObject({ focalLengthMm: 40, count: 2, type: 'bi-convex' })
    expect(byLabel.get('RT-1')).toMatchObject({ count: 5 })
  })

  it('when some lines of an import are bad then nothing is imported and each bad line is named with its problem', async () => {
    const before = (await as(viewer).get('/api/lenses')).body.lenses.length
    const csv = [
      'label,focal_length_mm,count,type',
      'OK-1,100,1,plano-convex',
      'BAD-1,abc,1,plano-convex',
      '',
      'BAD-2,100,-1,plano-convex',
      'OK-1,200,1,plano-convex',
      'BAD-3,100,1,prism',
    ].join('\n')
    const response = await as(technician).post('/api/lenses/import').set('Content-Type', 'text/csv').send(csv)
    expect(response.status).toBe(422)
    expect(response.body.error.code).toBe('invalid_csv')
    const { message } = response.body.error
    expect(message).toMatch(/^Nothing was imported\./)
    expect(message).toContain('line 3: focal_length_mm "abc" is not a number')
    expect(message).toContain('line 5: count must be 0 or more')
    expect(message).toContain('line 6: label "OK-1" appears again (first on line 2)')
    expect(message).toContain('line 7: type must be one of')
    expect((await as(viewer).get('/api/lenses')).body.lenses.length).toBe(before)
  })

  it('when the header or the body is missing then the answer says what the file needs', async () => {
    const noFocal = await as(technician).post('/api/lenses/import').set('Content-Type', 'text/csv').send('label,count\nA,1\n')
    expect(noFocal.status).toBe(422)
    expect(noFocal.body.error.message).toContain('missing: focal_length_mm')
    const empty = await as(technician).post('/api/lenses/import').set('Content-Type', 'text/csv').send('')
    expect(empty.status).toBe(400)
    expect(empty.body.error.code).toBe('no_csv')
    const headerOnly = await as(technician).post('/api/lenses/import').set('Content-Type', 'text/csv').send('label,focal_length_mm\n')
    expect(headerOnly.status).toBe(422)
    expect(headerOnly.body.error.message).toContain('no lenses')
  })
})

/**
 * Issue 17, item 6: what used to be a 500. A NUL byte in a query or a field is a 400 naming where; while the
 * database is away every read and upload is a 503 that says to try again.
 */
import pino from 'pino'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { loadConfig } from '../../server/config'
import { startServer, type RunningServer } from '../../server/server'
import { createActor, type TestActor } from '../support/actors'
import { generatedTraceCsv, testCavityGeometry } from '../support/traceFiles'
import { startTestServer, type TestServer } from '../support/testServer'

describe('NUL bytes', () => {
  let server: TestServer
  let lead: TestActor
  let cavityId: string
  beforeAll(async () => {
    server = await startTestServer()
    lead = await createActor(server.db, 'lead')
    const created = await request(server.url).post('/api/cavities').set('Authorization', lead.authorization).send({ name: 'NUL cavity', ...testCavityGeometry })
    cavityId = created.body.cavity.id
  })
  afterAll(() => server.close())

  it('when a query holds a NUL byte then 400 nul_byte', async () => {
    const response = await request(server.url).get('/api/log-entries?q=mirror%00clean').set('Authorization', lead.authorization)
    expect(response.status).toBe(400)
    expect(response.body.error).toEqual({ code: 'nul_byte', message: expect.stringContaining('NUL byte') })
  })

  it('when a JSON field holds a NUL byte then 400 names the field and nothing is created', async () => {
    const response = await request(server.url).post('/api/cavities').set('Authorization', lead.authorization).send({ ...testCavityGeometry, name: 'bad\u0000name' })
    expect(response.status).toBe(400)
    expect(response.body.error.code).toBe('nul_byte')
    expect(response.body.error.message).toContain('field name')
    expect(await server.db('cavities').where('name', 'like', 'bad%').first()).toBeUndefined()
  })

  it('when a multipart text field holds a NUL byte then 400 and no trace is stored', async () => {
    const response = await request(server.url)
      .post(`/api/cavities/${cavityId}/traces`)
      .set('Authorization', lead.authorization)
      .field('note', 'after\u0000cleaning')
      .attach('file', Buffer.from(generatedTraceCsv({ seed: 21 })), 'nul-note.csv')
    expect(response.status).toBe(400)
    expect(['nul_byte', 'bad_character']).toContain(response.body.error.code)
    expect(await server.db('traces').where({ file_name: 'nul-note.csv' }).first()).toBeUndefined()
  })
})

describe('while the database is away', () => {
  let down: RunningServer
  let actor: TestActor
  beforeAll(async () => {
    // A real token from the test database, shown to a server whose database (port 1) refuses every connection.
    const helper = await startTestServer()
    actor = await createActor(helper.db, 'experimenter')
    await helper.close()
    const config = loadConfig({ NODE_ENV: 'test', PORT: '0', LOG_LEVEL: 'silent', DATABASE_URL: 'postgres://postgres@127.0.0.1:1/none' })
    down = await startServer(config, { logger: pino({ level: 'silent' }) })
  })
  afterAll(() => down.stop())

  it('when a list is read then 503 database_unavailable says to try again, with Retry-After', async () => {
    const response = await request(down.url).get('/api/cavities').set('Authorization', actor.authorization)
    expect(response.status).toBe(503)
    expect(response.body.error).toEqual({ code: 'database_unavailable', message: expect.stringMatching(/Try again/) })
    expect(Number(response.headers['retry-after'])).toBeGreaterThan(0)
  })

  it('when a trace is uploaded then 503 as well', async () => {
    const response = await request(down.url).post('/api/cavities/1/traces').set('Authorization', actor.authorization).attach('file', Buffer.from('t,v\n0,1\n'), 'x.csv')
    expect(response.status).toBe(503)
    expect(response.body.error.code).toBe('database_unavailable')
  })
})

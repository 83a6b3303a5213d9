import request from 'supertest'
import pino from 'pino'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { loadConfig } from '../../server/config'
import { startServer } from '../../server/server'
import { startTestServer, type TestServer } from '../support/testServer'

describe('GET /api/health', () => {
  let server: TestServer
  beforeAll(async () => {
    server = await startTestServer()
  })
  afterAll(() => server.close())

  it('when the database answers then it reports ok with the version', async () => {
    const response = await request(server.url).get('/api/health')
    expect(response.status).toBe(200)
    expect(response.body).toEqual({ status: 'ok', db: 'ok', version: expect.stringMatching(/^\d+\.\d+\.\d+/) })
  })

  it('when the database is unreachable then it answers 503 with db "down"', async () => {
    // Port 1 on loopback: nothing listens there, so every connection is refused.
    const config = loadConfig({ NODE_ENV: 'test', PORT: '0', LOG_LEVEL: 'silent', DATABASE_URL: 'postgres://postgres@127.0.0.1:1/none' })
    const down = await startServer(config, { logger: pino({ level: 'silent' }) })
    try {
      const response = await request(down.url).get('/api/health')
      expect(response.status).toBe(503)
      expect(response.body).toMatchObject({ db: 'down', status: 'degraded' })
    } finally {
      await down.stop()
    }
  })

  it('when an API path does not exist then it answers 404 in the house error shape', async () => {
    const response = await request(server.url).get('/api/no-such-thing')
    expect(response.status).toBe(404)
    expect(response.body).toEqual({ error: { code: 'not_found', message: expect.stringContaining('/api/no-such-thing') } })
  })

  it('when the JSON body is malformed then it answers 400 in the house error shape', async () => {
    const response = await request(server.url).post('/api/health').set('Content-Type', 'application/json').send('{"broken":')
    expect(response.status).toBe(400)
    expect(response.body.error.code).toBe('malformed_json')
  })

  it('when the port is taken then starting fails with a message naming the port', async () => {
    const config = { ...server.config, PORT: server.port }
    await expect(startServer(config, { logger: pino({ level: 'silent' }) })).rejects.toThrow(`Port ${server.port} on 127.0.0.1 is already in use`)
  })
})

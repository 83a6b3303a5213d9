/**
 * Issue 17, item 11 (operations): a signed-in person changes their own password; authenticated API answers are
 * never cached (Cache-Control: no-store).
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestServer, type TestServer } from '../../support/testServer'
import { browserAgent, createPerson, signedIn, testPassword } from './accountsTestKit'

describe('changing one’s own password', () => {
  let server: TestServer
  beforeAll(async () => {
    server = await startTestServer()
  })
  afterAll(() => server.close())

  it('when the current password is right then the new one works, the old one not, and other sessions end while this one goes on', async () => {
    const person = await createPerson(server, 'experimenter')
    const here = await signedIn(server, person.email)
    const elsewhere = await signedIn(server, person.email)
    const changed = await here.post('/api/auth/password').send({ currentPassword: testPassword, newPassword: 'a fresh lab passphrase' })
    expect(changed.status, JSON.stringify(changed.body)).toBe(200)
    expect((await here.get('/api/auth/me')).status).toBe(200)
    expect((await elsewhere.get('/api/auth/me')).status).toBe(401)
    expect((await browserAgent(server).post('/api/auth/login').send({ email: person.email, password: testPassword })).status).toBe(401)
    expect((await browserAgent(server).post('/api/auth/login').send({ email: person.email, password: 'a fresh lab passphrase' })).status).toBe(200)
    expect(await server.db('audit_events').where({ event: 'auth.password_changed', subject: person.email }).first()).toBeDefined()
  })

  it('when the current password is wrong or the new one weak then nothing changes', async () => {
    const person = await createPerson(server, 'viewer')
    const agent = await signedIn(server, person.email)
    const wrong = await agent.post('/api/auth/password').send({ currentPassword: 'not it, not it', newPassword: 'another good passphrase' })
    expect(wrong.status).toBe(403)
    expect(wrong.body.error.code).toBe('wrong_password')
    const weak = await agent.post('/api/auth/password').send({ currentPassword: testPassword, newPassword: 'short' })
    expect(weak.status).toBe(400)
    expect(weak.body.error.message).toMatch(/at least 12/)
    expect((await browserAgent(server).post('/api/auth/login').send({ email: person.email, password: testPassword })).status).toBe(200)
  })

  it('when an API token asks to change the password then 403 session_required', async () => {
    const person = await createPerson(server, 'viewer')
    const { secret } = (await (await signedIn(server, person.email)).post('/api/tokens').send({ name: 'script' })).body
    const response = await request(server.url).post('/api/auth/password').set('Authorization', `Bearer ${secret}`).send({ currentPassword: testPassword, newPassword: 'a token cannot do this' })
    expect(response.status).toBe(403)
    expect(response.body.error.code).toBe('session_required')
  })

  it('when a signed-in person reads the API then the answer says Cache-Control: no-store; anonymous health does not', async () => {
    const person = await createPerson(server, 'viewer')
    const agent = await signedIn(server, person.email)
    expect((await agent.get('/api/auth/me')).headers['cache-control']).toBe('no-store')
    expect((await agent.get('/api/cavities')).headers['cache-control']).toBe('no-store')
    expect((await request(server.url).get('/api/health')).headers['cache-control']).not.toBe('no-store')
  })
})

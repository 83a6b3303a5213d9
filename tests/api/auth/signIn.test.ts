import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestServer, type TestServer } from '../../support/testServer'
import { browserAgent, createPerson, signedIn, testPassword } from './accountsTestKit'

describe('sign-in, sessions and cross-site request forgery', () => {
  let server: TestServer
  beforeAll(async () => {
    server = await startTestServer()
  })
  afterAll(() => server.close())

  it('when the password is right then the answer carries the user and an httpOnly SameSite=Lax session cookie with an expiry', async () => {
    const person = await createPerson(server, 'experimenter', { name: 'Wilma Testbank' })
    const response = await browserAgent(server).post('/api/auth/login').send({ email: person.email.toUpperCase(), password: testPassword })
    expect(response.status).toBe(200)
    expect(response.body.user).toMatchObject({ id: person.id, email: person.email, name: 'Wilma Testbank', role: 'experimenter', via: 'session' })
    expect(response.body.user.permissions).toContain('traces.upload')
    expect(response.body.user.permissions).not.toContain('users.manage')
    const cookie = String(response.headers['set-cookie'])
    expect(cookie).toMatch(/^ct_session=/)
    expect(cookie).toMatch(/HttpOnly/i)
    expect(cookie).toMatch(/SameSite=Lax/i)
    // 12 h default (config SESSION_HOURS), not a browser-session cookie.
    expect(cookie).toMatch(/Max-Age=43200/)
    expect(response.body).not.toHaveProperty('user.passwordHash')
  })

  it('when the password is wrong or the address unknown then both answer the same 401', async () => {
    const person = await createPerson(server, 'viewer')
    const wrong = await browserAgent(server).post('/api/auth/login').send({ email: person.email, password: 'not the password at all' })
    const unknown = await browserAgent(server).post('/api/auth/login').send({ email: 'nobody@lab.cavitrace.test', password: 'not the password at all' })
    expect(wrong.status).toBe(401)
    expect(unknown.status).toBe(401)
    expect(wrong.body).toEqual(unknown.body)
    expect(wrong.body.error.code).toBe('wrong_credentials')
  })

  it('when signed in then /api/auth/me answers the person, and after sign-out the same cookie no longer works', async () => {
    const person = await createPerson(server, 'lead')
    const agent = await signedIn(server, person.email)
    const me = await agent.get('/api/auth/me')
    expect(me.status).toBe(200)
    expect(me.body.user.email).toBe(person.email)
    const stolenCookie = (await request(server.url).post('/api/auth/login').set('Origin', server.url).send({ email: person.email, password: testPassword })).headers['set-cookie']
    expect((await agent.post('/api/auth/logout')).status).toBe(204)
    expect((await agent.get('/api/auth/me')).status).toBe(401)
    // Sign-out moves the session version on, so a copy of an earlier cookie is dead too.
    expect((await request(server.url).get('/api/auth/me').set('Cookie', stolenCookie)).status).toBe(401)
  })

  it('when nobody is signed in then /api/auth/me answers 401 in the house error shape', async () => {
    const response = await request(server.url).get('/api/auth/me')
    expect(response.status).toBe(401)
    expect(response.body).toEqual({ error: { code: 'not_signed_in', message: 'Sign in to continue.' } })
  })

  it('when a cookie is forged with another key then it is ignored', async () => {
    const jwt = (await import('jsonwebtoken')).default
    const person = await createPerson(server, 'admin')
    const forged = jwt.sign({ sv: 1 }, 'x'.repeat(40), { subject: String(person.id), issuer: 'cavitrace', audience: 'cavitrace-session', expiresIn: 3600 })
    expect((await request(server.url).get('/api/auth/me').set('Cookie', `ct_session=${forged}`)).status).toBe(401)
  })

  it('when a disabled person signs in with the right password then the answer is the same 401 as for a wrong one (issue 17: no confirmation of the password)', async () => {
    const person = await createPerson(server, 'technician')
    await server.db('users').where({ id: person.id }).update({ disabled_at: server.db.fn.now() })
    const right = await browserAgent(server).post('/api/auth/login').send({ email: person.email, password: testPassword })
    const wrongOne = await browserAgent(server).post('/api/auth/login').send({ email: person.email, password: 'not the password at all' })
    expect(right.status).toBe(401)
    expect(right.body).toEqual(wrongOne.body)
    expect(right.headers['set-cookie']).toBeUndefined()
  })

  it('when a cookie-authenticated write comes from another origin, or says nothing of its origin, then it is refused as CSRF (OWASP CSRF Prevention Cheat Sheet)', async () => {
    const person = await createPerson(server, 'admin')
    const agent = await signedIn(server, person.email)
    const cookie = (await request(server.url).post('/api/auth/login').set('Origin', server.url).send({ email: person.email, password: testPassword })).headers['set-cookie']
    const crossSite = await request(server.url).post('/api/tokens').set('Cookie', cookie).set('Origin', 'https://evil.example').send({ name: 'x' })
    expect(crossSite.status).toBe(403)
    expect(crossSite.body.error.code).toBe('csrf_refused')
    const fetchMetadata = await request(server.url).post('/api/tokens').set('Cookie', cookie).set('Sec-Fetch-Site', 'cross-site').send({ name: 'x' })
    expect(fetchMetadata.status).toBe(403)
    const silent = await request(server.url).post('/api/tokens').set('Cookie', cookie).send({ name: 'x' })
    expect(silent.status).toBe(403)
    const sameOrigin = await request(server.url).post('/api/tokens').set('Cookie', cookie).set('Origin', server.url).set('Sec-Fetch-Site', 'same-origin').send({ name: 'x' })
    expect(sameOrigin.status).toBe(201)
    expect((await agent.get('/api/auth/me')).status).toBe(200)
  })

  it('when the input is malformed then sign-in answers 400 naming the field', async () => {
    const response = await browserAgent(server).post('/api/auth/login').send({ email: 'not-an-address', password: 'whatever whatever' })
    expect(response.status).toBe(400)
    expect(response.body.error.code).toBe('invalid_input')
    expect(response.body.error.message).toMatch(/^email:/)
  })

  it('when sign-in fails more often than AUTH_RATE_LIMIT then further attempts get 429 with a clear message, while successful sign-ins do not count', async () => {
    const limited = await startTestServer({ AUTH_RATE_LIMIT: '3' })
    try {
      const person = await createPerson(limited, 'viewer')
      for (let i = 0; i < 4; i++) expect((await signedIn(limited, person.email).then(() => 200))).toBe(200)
      for (let i = 0; i < 3; i++) expect((await browserAgent(limited).post('/api/auth/login').send({ email: person.email, password: 'wrong wrong wrong' })).status).toBe(401)
      const blocked = await browserAgent(limited).post('/api/auth/login').send({ email: person.email, password: testPassword })
      expect(blocked.status).toBe(429)
      expect(blocked.body.error).toEqual({ code: 'too_many_attempts', message: expect.stringMatching(/^Too many failed sign-in attempts from this address\. Wait \d+ minutes? and try again\.$/) })
    } finally {
      await limited.close()
    }
  })

  it('when APP_URL is set then a write whose Origin only matches the Host header is refused, and APP_URL is accepted (issue 17)', async () => {
    const behindName = await startTestServer({ APP_URL: 'https://cavitrace.lab.example' })
    try {
      const person = await createPerson(behindName, 'viewer')
      const hostOnly = await request(behindName.url).post('/api/auth/login').set('Origin', behindName.url).send({ email: person.email, password: testPassword })
      expect(hostOnly.status).toBe(403)
      expect(hostOnly.body.error.code).toBe('csrf_refused')
      const named = await request(behindName.url).post('/api/auth/login').set('Origin', 'https://cavitrace.lab.example').send({ email: person.email, password: testPassword })
      expect(named.status).toBe(200)
    } finally {
      await behindName.close()
    }
  })

  it('when sign-in succeeds or fails then the audit log records both', async () => {
    const person = await createPerson(server, 'viewer')
    await signedIn(server, person.email)
    await browserAgent(server).post('/api/auth/login').send({ email: person.email, password: 'definitely not it' })
    const events = await server.db('audit_events').where({ subject: person.email }).orderBy('id').pluck('event')
    expect(events).toEqual(['auth.sign_in', 'auth.sign_in_failed'])
  })
})

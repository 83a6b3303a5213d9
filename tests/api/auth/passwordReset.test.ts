import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { lastMailId, linkIn, waitForMail } from '../../support/mailbox'
import { startTestServer, type TestServer } from '../../support/testServer'
import { browserAgent, createPerson, signedIn, testPassword } from './accountsTestKit'

describe('password reset, end to end through the SMTP fake', () => {
  let server: TestServer
  beforeAll(async () => {
    server = await startTestServer()
  })
  afterAll(() => server.close())

  async function requestLink(email: string): Promise<string> {
    const before = await lastMailId(server.db)
    const response = await browserAgent(server).post('/api/auth/reset-request').send({ email })
    expect(response.status).toBe(202)
    return linkIn(await waitForMail(server.db, email, { subject: /Reset/, afterId: before }), '/reset-password').token
  }

  it('when the address exists or not then the request answers exactly the same', async () => {
    const person = await createPerson(server, 'viewer')
    const known = await browserAgent(server).post('/api/auth/reset-request').send({ email: person.email })
    const unknown = await browserAgent(server).post('/api/auth/reset-request').send({ email: 'no-such-person@lab.cavitrace.test' })
    expect(known.status).toBe(202)
    expect(unknown.status).toBe(202)
    expect(known.body).toEqual(unknown.body)
    await waitForMail(server.db, person.email)
    // Give a stray message time to arrive before checking that none went to the unknown address.
    await new Promise((resolve) => setTimeout(resolve, 300))
    expect(await server.db('outbox_messages').whereRaw("'no-such-person@lab.cavitrace.test' = any(envelope_to)")).toHaveLength(0)
  })

  it('when the address is known then the answer does not wait for the link to be stored (no timing difference to read, issue 17)', async () => {
    const person = await createPerson(server, 'viewer')
    // Hold the table the link goes into: an answer that waited for the insert could not come while this lock stands.
    const lock = await server.db.transaction()
    try {
      await lock.raw('LOCK TABLE password_resets IN ACCESS EXCLUSIVE MODE')
      const known = await browserAgent(server).post('/api/auth/reset-request').send({ email: person.email }).timeout(5000)
      expect(known.status).toBe(202)
      expect(await lock('password_resets').where({ user_id: person.id })).toHaveLength(0)
    } finally {
      await lock.commit()
    }
    // Once the table is free the link is stored and mailed.
    await waitForMail(server.db, person.email, { subject: /Reset/ })
    expect(await server.db('password_resets').where({ user_id: person.id })).toHaveLength(1)
  })

  it('when the link is followed then the new password works, the old one and every earlier session stop working', async () => {
    const person = await createPerson(server, 'experimenter')
    const earlier = await signedIn(server, person.email)
    const token = await requestLink(person.email)
    expect(JSON.stringify(await server.db('password_resets').select())).not.toContain(token)

    const reset = await browserAgent(server).post('/api/auth/reset').send({ token, password: 'my brand new passphrase' })
    expect(reset.status).toBe(200)
    expect((await earlier.get('/api/auth/me')).status).toBe(401)
    expect((await browserAgent(server).post('/api/auth/login').send({ email: person.email, password: testPassword })).status).toBe(401)
    expect((await browserAgent(server).post('/api/auth/login').send({ email: person.email, password: 'my brand new passphrase' })).status).toBe(200)
    expect(await server.db('audit_events').where({ event: 'auth.password_reset', subject: person.email })).toHaveLength(1)
  })

  it('when a reset link is used a second time then it is refused with a clear message', async () => {
    const person = await createPerson(server, 'viewer')
    const token = await requestLink(person.email)
    expect((await browserAgent(server).post('/api/auth/reset').send({ token, password: 'first new passphrase' })).status).toBe(200)
    const again = await browserAgent(server).post('/api/auth/reset').send({ token, password: 'second new passphrase' })
    expect(again.status).toBe(410)
    expect(again.body.error).toEqual({ code: 'reset_link_used', message: expect.stringContaining('already been used') })
  })

  it('when a reset link is older than one hour then it is refused as expired', async () => {
    const person = await createPerson(server, 'viewer')
    const token = await requestLink(person.email)
    await server.db('password_resets').where({ user_id: person.id }).update({ expires_at: new Date(Date.now() - 1000) })
    const response = await browserAgent(server).post('/api/auth/reset').send({ token, password: 'too late passphrase' })
    expect(response.status).toBe(410)
    expect(response.body.error).toEqual({ code: 'reset_link_expired', message: expect.stringContaining('expired') })
  })

  it('when a fresh link has been issued then an older one still works until either is used; using one uses up both', async () => {
    const person = await createPerson(server, 'viewer')
    const first = await requestLink(person.email)
    const second = await requestLink(person.email)
    expect((await browserAgent(server).post('/api/auth/reset').send({ token: second, password: 'chosen from the second' })).status).toBe(200)
    expect((await browserAgent(server).post('/api/auth/reset').send({ token: first, password: 'chosen from the first' })).body.error.code).toBe('reset_link_used')
  })

  it('when the new password is the person’s own address or too short then it is refused and the link stays usable (NIST SP 800-63B §5.1.1.2)', async () => {
    const person = await createPerson(server, 'viewer')
    const token = await requestLink(person.email)
    const own = await browserAgent(server).post('/api/auth/reset').send({ token, password: person.email })
    expect(own.status).toBe(400)
    expect(own.body.error).toEqual({ code: 'weak_password', message: 'A password must not be your e-mail address.' })
    const short = await browserAgent(server).post('/api/auth/reset').send({ token, password: 'short' })
    expect(short.body.error.message).toMatch(/at least 12 characters/)
    expect((await browserAgent(server).post('/api/auth/reset').send({ token, password: 'a perfectly good one' })).status).toBe(200)
  })

  it('when reset requests exceed AUTH_RATE_LIMIT then they get 429', async () => {
    const limited = await startTestServer({ AUTH_RATE_LIMIT: '2' })
    try {
      for (let i = 0; i < 2; i++) expect((await request(limited.url).post('/api/auth/reset-request').send({ email: 'x@lab.cavitrace.test' })).status).toBe(202)
      const blocked = await request(limited.url).post('/api/auth/reset-request').send({ email: 'x@lab.cavitrace.test' })
      expect(blocked.status).toBe(429)
      expect(blocked.body.error.message).toMatch(/^Too many password reset requests from this address/)
    } finally {
      await limited.close()
    }
  })
})

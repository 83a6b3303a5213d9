/**
 * Issue 17, item 4: the sign-in and reset limits cannot be dodged by rotating X-Forwarded-For (it is believed only
 * from the proxy TRUST_PROXY names), and one account is throttled whatever address the attempts come from.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestServer, type TestServer } from '../../support/testServer'
import { browserAgent, createPerson, testPassword, uniqueEmail } from './accountsTestKit'

const wrong = 'not the password at all'
let hop = 0
/** A made-up client address per call, as a forger would send it. */
const forged = () => `198.51.100.${(hop = (hop % 250) + 1)}`

describe('without TRUST_PROXY', () => {
  let server: TestServer
  beforeAll(async () => {
    server = await startTestServer({ AUTH_RATE_LIMIT: '3', AUTH_ACCOUNT_RATE_LIMIT: '1000' })
  })
  afterAll(() => server.close())

  it('when failed sign-ins rotate X-Forwarded-For then the address limit still applies (429 after 3)', async () => {
    const statuses: number[] = []
    for (let i = 0; i < 5; i++) {
      const response = await browserAgent(server).post('/api/auth/login').set('X-Forwarded-For', forged()).send({ email: uniqueEmail('guess'), password: wrong })
      statuses.push(response.status)
    }
    expect(statuses).toEqual([401, 401, 401, 429, 429])
  })
})

describe('with TRUST_PROXY=loopback (a proxy on this machine)', () => {
  let server: TestServer
  beforeAll(async () => {
    server = await startTestServer({ TRUST_PROXY: 'loopback', AUTH_RATE_LIMIT: '3', AUTH_ACCOUNT_RATE_LIMIT: '3', AUTH_ACCOUNT_RESET_LIMIT: '2' })
  })
  afterAll(() => server.close())

  it('when the proxy reports different clients then each has its own address limit', async () => {
    for (let i = 0; i < 5; i++) {
      const response = await browserAgent(server).post('/api/auth/login').set('X-Forwarded-For', forged()).send({ email: uniqueEmail('other'), password: wrong })
      expect(response.status).toBe(401)
    }
  })

  it('when one account fails from many addresses then it is throttled (429 for this account, even with the right password)', async () => {
    const person = await createPerson(server, 'viewer')
    for (let i = 0; i < 3; i++) {
      expect((await browserAgent(server).post('/api/auth/login').set('X-Forwarded-For', forged()).send({ email: person.email, password: wrong })).status).toBe(401)
    }
    const blocked = await browserAgent(server).post('/api/auth/login').set('X-Forwarded-For', forged()).send({ email: person.email.toUpperCase(), password: testPassword })
    expect(blocked.status).toBe(429)
    expect(blocked.body.error.message).toMatch(/^Too many failed sign-in attempts for this account\. Wait \d+ minutes?/)
  })

  it('when reset links for one address are asked from many addresses then the third is refused and only two mails go', async () => {
    const person = await createPerson(server, 'viewer')
    const statuses: number[] = []
    for (let i = 0; i < 4; i++) statuses.push((await browserAgent(server).post('/api/auth/reset-request').set('X-Forwarded-For', forged()).send({ email: person.email })).status)
    expect(statuses).toEqual([202, 202, 429, 429])
    await server.mailer.settle()
    const mails = await server.db('outbox_messages').whereRaw('? = ANY(envelope_to)', [person.email]).count<{ count: string }[]>('* as count')
    expect(Number(mails[0].count)).toBe(2)
  })
})

/**
 * Issue 17, item 7: API tokens are managed from a session only, expire (default one year, shown in the list), and
 * an admin can revoke all of one person's tokens at once.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestServer, type TestServer } from '../../support/testServer'
import { createPerson, signedIn } from './accountsTestKit'

const DAY_MS = 24 * 3600 * 1000

describe('API token rules', () => {
  let server: TestServer
  beforeAll(async () => {
    server = await startTestServer()
  })
  afterAll(() => server.close())

  const bearer = (secret: string) => ({ Authorization: `Bearer ${secret}` })

  it('when a token asks to list or revoke tokens then 403 session_required', async () => {
    const person = await createPerson(server, 'experimenter')
    const agent = await signedIn(server, person.email)
    const { secret, token } = (await agent.post('/api/tokens').send({ name: 'script' })).body
    const list = await request(server.url).get('/api/tokens').set(bearer(secret))
    expect(list.status).toBe(403)
    expect(list.body.error.code).toBe('session_required')
    const revoke = await request(server.url).delete(`/api/tokens/${token.id}`).set(bearer(secret))
    expect(revoke.status).toBe(403)
    expect((await request(server.url).get('/api/cavities').set(bearer(secret))).status).toBe(200)
  })

  it('when a token is made without expiresAt then it expires in a year, and the list shows when', async () => {
    const person = await createPerson(server, 'viewer')
    const agent = await signedIn(server, person.email)
    const created = await agent.post('/api/tokens').send({ name: 'yearly' })
    expect(created.status).toBe(201)
    const expiresInDays = (Date.parse(created.body.token.expiresAt) - Date.now()) / DAY_MS
    expect(expiresInDays).toBeGreaterThan(364)
    expect(expiresInDays).toBeLessThan(367)
    const listed = (await agent.get('/api/tokens')).body.tokens
    expect(listed.find((t: { id: number }) => t.id === created.body.token.id).expiresAt).toBe(created.body.token.expiresAt)
  })

  it('when expiresAt is given then it is kept; in the past it is refused', async () => {
    const person = await createPerson(server, 'viewer')
    const agent = await signedIn(server, person.email)
    const soon = new Date(Date.now() + 7 * DAY_MS).toISOString()
    const created = await agent.post('/api/tokens').send({ name: 'a week', expiresAt: soon })
    expect(created.status).toBe(201)
    expect(Date.parse(created.body.token.expiresAt)).toBe(Date.parse(soon))
    const past = await agent.post('/api/tokens').send({ name: 'old', expiresAt: '2001-01-01' })
    expect(past.status).toBe(400)
    expect(past.body.error.message).toMatch(/expiresAt: must be in the future/)
  })

  it('when a token has expired then it no longer authenticates', async () => {
    const person = await createPerson(server, 'viewer')
    const agent = await signedIn(server, person.email)
    const { secret, token } = (await agent.post('/api/tokens').send({ name: 'lapsing' })).body
    expect((await request(server.url).get('/api/cavities').set(bearer(secret))).status).toBe(200)
    await server.db('api_tokens').where({ id: token.id }).update({ expires_at: new Date(Date.now() - 1000) })
    const refused = await request(server.url).get('/api/cavities').set(bearer(secret))
    expect(refused.status).toBe(401)
    expect(refused.body.error.message).toMatch(/expired/)
  })

  it('when an admin revokes a person’s tokens then all of them stop working and the audit says how many', async () => {
    const admin = await createPerson(server, 'admin')
    const person = await createPerson(server, 'technician')
    const agent = await signedIn(server, person.email)
    const secrets = [(await agent.post('/api/tokens').send({ name: 'one' })).body.secret, (await agent.post('/api/tokens').send({ name: 'two' })).body.secret]
    const adminAgent = await signedIn(server, admin.email)
    const answer = await adminAgent.delete(`/api/users/${person.id}/tokens`)
    expect(answer.status).toBe(200)
    expect(answer.body).toEqual({ revoked: 2 })
    for (const secret of secrets) expect((await request(server.url).get('/api/cavities').set(bearer(secret))).status).toBe(401)
    const audit = await server.db('audit_events').where({ event: 'token.revoked_all', subject: person.email }).first()
    expect(audit.details).toMatchObject({ revoked: 2 })
  })
})

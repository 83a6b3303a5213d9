import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { hashSecret } from '../../../server/tokens/secretTokens'
import { startTestServer, type TestServer } from '../../support/testServer'
import { createPerson, signedIn } from './accountsTestKit'

describe('API tokens for lab scripts', () => {
  let server: TestServer
  beforeAll(async () => {
    server = await startTestServer()
  })
  afterAll(() => server.close())

  it('when a token is created then its secret is shown once, only its hash is stored, and Bearer requests act with the owner’s role', async () => {
    const person = await createPerson(server, 'admin')
    const agent = await signedIn(server, person.email)
    const created = await agent.post('/api/tokens').send({ name: 'bench scope logger' })
    expect(created.status).toBe(201)
    const { secret, token } = created.body
    expect(secret).toMatch(/^ctk_[A-Za-z0-9_-]{43}$/)
    expect(token).toMatchObject({ name: 'bench scope logger', prefix: secret.slice(0, 10), revokedAt: null })
    const row = await server.db('api_tokens').where({ id: token.id }).first()
    expect(row.token_hash).toBe(hashSecret(secret))
    expect(JSON.stringify(row)).not.toContain(secret)
    const listed = await agent.get('/api/tokens')
    expect(JSON.stringify(listed.body)).not.toContain(secret)

    // An admin-only route, reached with the token alone (no cookie, no Origin: scripts are exempt from CSRF checks).
    const viaToken = await request(server.url).get('/api/users').set('Authorization', `Bearer ${secret}`)
    expect(viaToken.status).toBe(200)
    const me = await request(server.url).get('/api/auth/me').set('Authorization', `Bearer ${secret}`)
    expect(me.body.user).toMatchObject({ email: person.email, via: 'token' })
    // Tokens are managed from a session only: a token cannot mint another (issue 17).
    const write = await request(server.url).post('/api/tokens').set('Authorization', `Bearer ${secret}`).send({ name: 'made by a script' })
    expect(write.status).toBe(403)
    expect(write.body.error.code).toBe('session_required')
    expect((await server.db('api_tokens').where({ id: token.id }).first()).last_used_at).not.toBeNull()
  })

  it('when a token is revoked then it no longer authenticates and the audit log has both events', async () => {
    const person = await createPerson(server, 'experimenter')
    const agent = await signedIn(server, person.email)
    const { secret, token } = (await agent.post('/api/tokens').send({ name: 'upload script' })).body
    expect((await request(server.url).get('/api/auth/me').set('Authorization', `Bearer ${secret}`)).status).toBe(200)
    const revoked = await agent.delete(`/api/tokens/${token.id}`)
    expect(revoked.status).toBe(200)
    expect(revoked.body.token.revokedAt).not.toBeNull()
    const refused = await request(server.url).get('/api/auth/me').set('Authorization', `Bearer ${secret}`)
    expect(refused.status).toBe(401)
    expect(refused.body.error.code).toBe('invalid_token')
    const events = await server.db('audit_events').where({ actor_id: person.id }).whereIn('event', ['token.created', 'token.revoked']).orderBy('id').pluck('event')
    expect(events).toEqual(['token.created', 'token.revoked'])
  })

  it('when the owner is disabled then the token stops working, and works again when re-enabled', async () => {
    const admin = await signedIn(server, (await createPerson(server, 'admin')).email)
    const person = await createPerson(server, 'technician')
    const { secret } = (await (await signedIn(server, person.email)).post('/api/tokens').send({ name: 'logbook camera' })).body
    expect((await admin.patch(`/api/users/${person.id}`).send({ disabled: true })).status).toBe(200)
    expect((await request(server.url).get('/api/auth/me').set('Authorization', `Bearer ${secret}`)).status).toBe(401)
    expect((await admin.patch(`/api/users/${person.id}`).send({ disabled: false })).status).toBe(200)
    expect((await request(server.url).get('/api/auth/me').set('Authorization', `Bearer ${secret}`)).status).toBe(200)
  })

  it('when the header is malformed or the token made up then the answer is 401, never anonymous', async () => {
    expect((await request(server.url).get('/api/auth/me').set('Authorization', 'Bearer ctk_made-up')).status).toBe(401)
    expect((await request(server.url).get('/api/auth/me').set('Authorization', 'Basic dXNlcjpwYXNz')).body.error.code).toBe('invalid_token')
  })

  it('when someone tries to revoke another person’s token then it looks absent; an admin may revoke it and list everyone’s', async () => {
    const owner = await createPerson(server, 'lead')
    const { token } = (await (await signedIn(server, owner.email)).post('/api/tokens').send({ name: 'lead script' })).body
    const other = await signedIn(server, (await createPerson(server, 'lead')).email)
    expect((await other.delete(`/api/tokens/${token.id}`)).status).toBe(404)
    expect((await other.get('/api/tokens?all=1')).status).toBe(403)
    const admin = await signedIn(server, (await createPerson(server, 'admin')).email)
    const everyone = await admin.get('/api/tokens?all=1')
    expect(everyone.body.tokens.find((row: { id: number }) => row.id === token.id)).toMatchObject({ owner: { email: owner.email } })
    expect((await admin.delete(`/api/tokens/${token.id}`)).status).toBe(200)
  })
})

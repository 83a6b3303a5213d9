import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { demoPassword, demoPeople } from '../../../shared/auth/demoAccounts'
import { seedDemo } from '../../../db/seeds/seedDemo'
import { startTestServer, type TestServer } from '../../support/testServer'
import { browserAgent, createPerson, signedIn, testPassword, uniqueEmail } from './accountsTestKit'

describe('people, roles and the audit log', () => {
  let server: TestServer
  beforeAll(async () => {
    server = await startTestServer()
  })
  afterAll(() => server.close())

  it('when an admin changes someone’s role then it applies to their very next request and is audited', async () => {
    const admin = await signedIn(server, (await createPerson(server, 'admin')).email)
    const person = await createPerson(server, 'viewer')
    const them = await signedIn(server, person.email)
    expect((await them.get('/api/users')).status).toBe(403)
    const changed = await admin.patch(`/api/users/${person.id}`).send({ role: 'admin' })
    expect(changed.status).toBe(200)
    expect(changed.body.user).toMatchObject({ id: person.id, role: 'admin', disabled: false })
    expect((await them.get('/api/users')).status).toBe(200)
    const audit = await admin.get('/api/audit?event=user.role_changed')
    expect(audit.body.events[0]).toMatchObject({ event: 'user.role_changed', subject: person.email, details: { from: 'viewer', to: 'admin' } })
  })

  it('when someone is disabled then their open session ends at once', async () => {
    const admin = await signedIn(server, (await createPerson(server, 'admin')).email)
    const person = await createPerson(server, 'lead')
    const them = await signedIn(server, person.email)
    expect((await admin.patch(`/api/users/${person.id}`).send({ disabled: true })).body.user.disabled).toBe(true)
    expect((await them.get('/api/auth/me')).status).toBe(401)
    const users = (await admin.get('/api/users')).body.users as Array<{ id: number; disabled: boolean }>
    expect(users.find((row) => row.id === person.id)?.disabled).toBe(true)
  })

  it('when the last active admin would be demoted or disabled then it is refused', async () => {
    const lonely = await startTestServer()
    try {
      const person = await createPerson(lonely, 'admin')
      const admin = await signedIn(lonely, person.email)
      const demote = await admin.patch(`/api/users/${person.id}`).send({ role: 'lead' })
      expect(demote.status).toBe(409)
      expect(demote.body.error.code).toBe('last_admin')
      expect((await admin.patch(`/api/users/${person.id}`).send({ disabled: true })).status).toBe(409)
      const second = await createPerson(lonely, 'admin')
      expect((await admin.patch(`/api/users/${second.id}`).send({ disabled: true })).status).toBe(200)
      expect((await admin.patch(`/api/users/${person.id}`).send({ role: 'viewer' })).status).toBe(409)
    } finally {
      await lonely.close()
    }
  })

  it('when the patch is empty, unknown or names a missing person then the answers are 400 and 404', async () => {
    const admin = await signedIn(server, (await createPerson(server, 'admin')).email)
    expect((await admin.patch('/api/users/1').send({})).status).toBe(400)
    expect((await admin.patch('/api/users/1').send({ role: 'overlord' })).body.error.message).toMatch(/^role: must be one of admin, lead/)
    expect((await admin.patch('/api/users/1').send({ password_hash: 'x' })).status).toBe(400)
    expect((await admin.patch('/api/users/999999').send({ name: 'Ghost' })).status).toBe(404)
  })

  it('when the audit log is read then it is newest first and pages back with `before`', async () => {
    const admin = await signedIn(server, (await createPerson(server, 'admin')).email)
    const first = (await admin.get('/api/audit?limit=2')).body.events
    expect(first).toHaveLength(2)
    expect(first[0].id).toBeGreaterThan(first[1].id)
    const next = (await admin.get(`/api/audit?limit=2&before=${first[1].id}`)).body.events
    expect(next[0].id).toBeLessThan(first[1].id)
  })

  it('when the server starts with CAVITRACE_ADMIN_EMAIL and no admin exists then that admin can sign in; with an admin present nothing changes', async () => {
    const email = uniqueEmail('first-admin')
    const fresh = await startTestServer({ CAVITRACE_ADMIN_EMAIL: email, CAVITRACE_ADMIN_PASSWORD: 'bootstrap passphrase here' })
    try {
      const answer = await browserAgent(fresh).post('/api/auth/login').send({ email, password: 'bootstrap passphrase here' })
      expect(answer.status).toBe(200)
      expect(answer.body.user.role).toBe('admin')
      const { bootstrapAdmin } = await import('../../../server/auth/bootstrapAdmin')
      expect(await bootstrapAdmin(fresh.db, { email: uniqueEmail('second'), password: 'another passphrase here' })).toBe('admin_exists')
      expect(await fresh.db('users').where({ role: 'admin' })).toHaveLength(1)
    } finally {
      await fresh.close()
    }
  })

  it('when the demo seed runs then each demo person signs in with the documented password and has their role', async () => {
    const demo = await startTestServer()
    try {
      await seedDemo(demo.db)
      expect(demoPeople.map((person) => person.role)).toEqual(['admin', 'lead', 'experimenter', 'technician', 'viewer'])
      for (const person of demoPeople) {
        const answer = await browserAgent(demo).post('/api/auth/login').send({ email: person.email, password: demoPassword })
        expect(answer.body.user).toMatchObject({ email: person.email, role: person.role })
      }
      expect((await browserAgent(demo).post('/api/auth/login').send({ email: demoPeople[0].email, password: testPassword })).status).toBe(401)
    } finally {
      await demo.close()
    }
  })
})

import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { lastMailId, linkIn, waitForMail } from '../../support/mailbox'
import { startTestServer, type TestServer } from '../../support/testServer'
import { browserAgent, createPerson, signedIn, uniqueEmail, type SignedInAgent } from './accountsTestKit'

describe('invitations, end to end through the SMTP fake', () => {
  let server: TestServer
  let admin: SignedInAgent
  beforeAll(async () => {
    server = await startTestServer()
    admin = await signedIn(server, (await createPerson(server, 'admin', { name: 'Inge Inviter' })).email)
  })
  afterAll(() => server.close())

  async function invite(email: string, role = 'experimenter') {
    const before = await lastMailId(server.db)
    const response = await admin.post('/api/invitations').send({ email, role })
    expect(response.status).toBe(201)
    const mail = await waitForMail(server.db, email, { subject: /invited/, afterId: before })
    return { invitation: response.body.invitation, mail, token: linkIn(mail, '/accept-invitation').token }
  }

  it('when an admin invites an address then a single-use link arrives by e-mail and accepting it creates a signed-in account with that role', async () => {
    const email = uniqueEmail('invitee')
    const { invitation, mail, token } = await invite(email, 'technician')
    expect(invitation).toMatchObject({ email, role: 'technician', status: 'pending' })
    // 72 h lifetime (issue 3), within a minute of now.
    expect(Math.abs(Date.parse(invitation.expiresAt) - Date.now() - 72 * 3600_000)).toBeLessThan(60_000)
    expect(mail.text).toContain('Inge Inviter has invited you to Cavitrace as Technician')
    expect(linkIn(mail, '/accept-invitation').url.startsWith(`${server.url}/accept-invitation#token=`)).toBe(true)
    // Only a hash is stored, never the token itself.
    expect(JSON.stringify(await server.db('invitations').select())).not.toContain(token)

    const newcomer = browserAgent(server)
    const accepted = await newcomer.post('/api/invitations/accept').send({ token, name: 'Nia Newcomer', password: 'three words are plenty' })
    expect(accepted.status).toBe(201)
    expect(accepted.body.user).toMatchObject({ email, name: 'Nia Newcomer', role: 'technician' })
    expect((await newcomer.get('/api/auth/me')).body.user.email).toBe(email)

    const list = await admin.get('/api/invitations')
    expect(list.body.invitations.find((row: { email: string }) => row.email === email)).toMatchObject({ status: 'accepted', invitedBy: expect.stringContaining('@') })
  })

  it('when an invitation link is used a second time then it is refused with a clear message', async () => {
    const { token } = await invite(uniqueEmail('twice'))
    expect((await browserAgent(server).post('/api/invitations/accept').send({ token, name: 'First Use', password: 'a fine long passphrase' })).status).toBe(201)
    const again = await browserAgent(server).post('/api/invitations/accept').send({ token, name: 'Second Use', password: 'another fine passphrase' })
    expect(again.status).toBe(410)
    expect(again.body.error).toEqual({ code: 'invitation_used', message: expect.stringContaining('already been used') })
  })

  it('when an invitation is older than 72 hours then it is refused as expired', async () => {
    const email = uniqueEmail('late')
    const { invitation, token } = await invite(email)
    await server.db('invitations').where({ id: invitation.id }).update({ expires_at: new Date(Date.now() - 1000) })
    const response = await browserAgent(server).post('/api/invitations/accept').send({ token, name: 'Too Late', password: 'a fine long passphrase' })
    expect(response.status).toBe(410)
    expect(response.body.error).toEqual({ code: 'invitation_expired', message: expect.stringContaining('expired') })
    expect(await server.db('users').where({ email }).first()).toBeUndefined()
  })

  it('when an address is invited twice then only the newest link works', async () => {
    const email = uniqueEmail('again')
    const first = await invite(email)
    const second = await invite(email)
    const old = await browserAgent(server).post('/api/invitations/accept').send({ token: first.token, name: 'Old Link', password: 'a fine long passphrase' })
    expect(old.status).toBe(410)
    expect(old.body.error.code).toBe('invitation_replaced')
    expect((await browserAgent(server).post('/api/invitations/accept').send({ token: second.token, name: 'New Link', password: 'a fine long passphrase' })).status).toBe(201)
  })

  it('when the chosen password breaks the policy then the invitation is not used up', async () => {
    const { token } = await invite(uniqueEmail('weak'))
    const weak = await browserAgent(server).post('/api/invitations/accept').send({ token, name: 'Weak Choice', password: 'password1234' })
    expect(weak.status).toBe(400)
    expect(weak.body.error.code).toBe('weak_password')
    expect((await browserAgent(server).post('/api/invitations/accept').send({ token, name: 'Weak Choice', password: 'now a proper passphrase' })).status).toBe(201)
  })

  it('when the token is made up or the address already has an account then the answers say so', async () => {
    const madeUp = await browserAgent(server).post('/api/invitations/accept').send({ token: 'x'.repeat(43), name: 'Nobody', password: 'a fine long passphrase' })
    expect(madeUp.status).toBe(400)
    expect(madeUp.body.error.code).toBe('invitation_invalid')
    const member = await createPerson(server, 'viewer')
    const duplicate = await admin.post('/api/invitations').send({ email: member.email, role: 'lead' })
    expect(duplicate.status).toBe(409)
    expect(duplicate.body.error.code).toBe('already_member')
  })

  it('when an invitation is created then the audit log names the admin, the address and the role', async () => {
    const email = uniqueEmail('audited')
    await invite(email, 'lead')
    const row = await server.db('audit_events').where({ event: 'invitation.created', subject: email }).first()
    expect(row).toMatchObject({ actor_email: expect.stringContaining('admin'), details: { role: 'lead' } })
  })

  it('when the outbox is asked for by an admin then it lists the caught mail; others get 403', async () => {
    const outbox = await admin.get('/api/outbox')
    expect(outbox.status).toBe(200)
    expect(outbox.body.messages.length).toBeGreaterThan(0)
    expect(outbox.body.messages[0]).toMatchObject({ subject: expect.any(String), to: expect.any(Array), text: expect.any(String) })
    const viewer = await signedIn(server, (await createPerson(server, 'viewer')).email)
    expect((await viewer.get('/api/outbox')).status).toBe(403)
    expect((await request(server.url).get('/api/outbox')).status).toBe(401)
  })
})

/**
 * Alerts (issue 7): per-cavity TEM00-fraction target and finesse-drop threshold; watchers get one
 * e-mail (through the SMTP fake) and an in-app notification when a new analysis goes into breach,
 * none while the breach goes on, and one again after a recovery. Also the weekly digest for leads.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { sendWeeklyDigest } from '../../server/alerts/weeklyDigest'
import type { AnalysisEvent } from '../../server/jobs/eventHub'
import { listOutbox } from '../../server/mail/outboxData'
import { createActor, type TestActor } from '../support/actors'
import { waitForMail } from '../support/mailbox'
import { generatedTraceCsv, testCavityGeometry } from '../support/traceFiles'
import { startTestServer, type TestServer } from '../support/testServer'

describe('alerts, notifications and the weekly digest', () => {
  let server: TestServer
  let lead: TestActor
  let experimenter: TestActor
  let viewer: TestActor
  let technician: TestActor
  const emails = new Map<TestActor, string>()
  let fractionCavityId: string
  let finesseCavityId: string
  /** Status events of the test cavities, heard in-process: "done" is announced after the alert check. */
  const events: AnalysisEvent[] = []
  let seed = 100

  const as = (actor: TestActor) => ({
    get: (path: string) => request(server.url).get(path).set('Authorization', actor.authorization),
    post: (path: string) => request(server.url).post(path).set('Authorization', actor.authorization),
    put: (path: string) => request(server.url).put(path).set('Authorization', actor.authorization),
    delete: (path: string) => request(server.url).delete(path).set('Authorization', actor.authorization),
  })

  /** Upload one generated trace and wait until its analysis is announced finished (alerts judged). */
  async function analyse(cavityId: string, overrides: Parameters<typeof generatedTraceCsv>[0], options: { drain?: boolean } = {}): Promise<{ analysisId: string; fraction: number; finesse: number }> {
    seed += 1
    const response = await as(experimenter).post(`/api/cavities/${cavityId}/traces`).attach('file', Buffer.from(generatedTraceCsv({ seed, ...overrides })), `scan-${seed}.csv`)
    expect(response.status).toBe(202)
    const analysisId = response.body.uploads[0].analysis.id as string
    const deadline = Date.now() + 30_000
    while (!events.some((event) => event.analysisId === analysisId && (event.status === 'done' || event.status === 'failed'))) {
      if (Date.now() > deadline) throw new Error(`analysis ${analysisId} was not announced finished`)
      await new Promise((resolve) => setTimeout(resolve, 50))
    }
    const done = await as(viewer).get(`/api/analyses/${analysisId}`)
    expect(done.body.status).toBe('done')
    if (options.drain ?? true) await server.alertMail.drain()
    return { analysisId, fraction: done.body.result.fundamentalFraction, finesse: done.body.result.finesse }
  }

  async function alertMailsTo(actor: TestActor): Promise<Array<{ subject: string; text: string }>> {
    return (await listOutbox(server.db, { to: emails.get(actor) })).filter((message) => message.subject.startsWith('Cavitrace alert'))
  }

  beforeAll(async () => {
    server = await startTestServer()
    lead = await createActor(server.db, 'lead')
    experimenter = await createActor(server.db, 'experimenter')
    viewer = await createActor(server.db, 'viewer')
    technician = await createActor(server.db, 'technician')
    for (const actor of [lead, experimenter, viewer, technician]) emails.set(actor, ((await server.db('users').where({ id: actor.id }).first('email')) as { email: string }).email)
    for (const name of ['Alert fraction cavity', 'Alert finesse cavity']) {
      const created = await as(lead).post('/api/cavities').send({ name, ...testCavityGeometry })
      expect(created.status).toBe(201)
      if (name.includes('fraction')) fractionCavityId = created.body.cavity.id
      else finesseCavityId = created.body.cavity.id
      server.analysis.events.subscribe(created.body.cavity.id, (event) => events.push(event))
    }
    // Let the event listener connect before the first upload.
    await new Promise((resolve) => setTimeout(resolve, 500))
  })
  afterAll(() => server?.close())

  it('when a lead sets the rules then they read back, and only targets.write may set them', async () => {
    const path = `/api/cavities/${fractionCavityId}/alerts`
    const refused = await as(experimenter).put(path).send({ targetFundamentalFraction: 0.7, finesseDropPercent: null })
    expect(refused.status).toBe(403)
    const badPercent = await as(lead).put(path).send({ targetFundamentalFraction: 75, finesseDropPercent: null })
    expect(badPercent.status).toBe(400)
    expect(badPercent.body.error.message).toContain('targetFundamentalFraction')

    const set = await as(lead).put(path).send({ targetFundamentalFraction: 0.7, finesseDropPercent: null })
    expect(set.status).toBe(200)
    expect(set.body).toMatchObject({ cavityId: fractionCavityId, settings: { targetFundamentalFraction: 0.7, finesseDropPercent: null }, states: [], watching: false, watcherCount: 0 })
    // The target is the cavity's own target, as the cavity API shows it.
    expect((await as(viewer).get(`/api/cavities/${fractionCavityId}`)).body.cavity.targetFundamentalFraction).toBe(0.7)
    expect((await as(lead).put(`/api/cavities/${finesseCavityId}/alerts`).send({ targetFundamentalFraction: null, finesseDropPercent: 20 })).status).toBe(200)
  })

  it('when people watch and unwatch then the cavity counts its watchers and knows whether the caller watches', async () => {
    for (const actor of [experimenter, viewer, technician]) {
      const watched = await as(actor).put(`/api/cavities/${fractionCavityId}/watch`)
      expect(watched.status).toBe(200)
      expect(watched.body.watching).toBe(true)
    }
    expect((await as(viewer).put(`/api/cavities/${fractionCavityId}/watch`)).body.watcherCount).toBe(3) // watching twice is watching once
    const unwatched = await as(technician).delete(`/api/cavities/${fractionCavityId}/watch`)
    expect(unwatched.body).toEqual({ cavityId: fractionCavityId, watching: false, watcherCount: 2 })
    const alerts = await as(viewer).get(`/api/cavities/${fractionCavityId}/alerts`)
    expect(alerts.body).toMatchObject({ watching: true, watcherCount: 2 })
    for (const actor of [experimenter, viewer]) expect((await as(actor).put(`/api/cavities/${finesseCavityId}/watch`)).status).toBe(200)
    expect((await request(server.url).put(`/api/cavities/${fractionCavityId}/watch`)).status).toBe(401)
  })

  it('when analyses go below the target, stay below, recover and fall again then each watcher gets exactly two e-mails', async () => {
    const above = await analyse(fractionCavityId, { orderPowers: [0.85, 0.08, 0.05, 0.02] })
    expect(above.fraction).toBeGreaterThan(0.7)
    expect(await alertMailsTo(viewer)).toHaveLength(0)

    const firstBreach = await analyse(fractionCavityId, { orderPowers: [0.55, 0.25, 0.15, 0.05] })
    expect(firstBreach.fraction).toBeLessThan(0.7)
    for (const actor of [experimenter, viewer]) {
      const mails = await alertMailsTo(actor)
      expect(mails).toHaveLength(1)
      expect(mails[0].subject).toMatch(/Alert fraction cavity: TEM00 fraction \d+\.\d % is below the target 70\.0 %/)
      expect(mails[0].text).toContain(`/analyses/${firstBreach.analysisId}`)
    }
    expect(await alertMailsTo(technician)).toHaveLength(0) // unwatched before the breach
    expect(await alertMailsTo(lead)).toHaveLength(0) // never watched
    const state = (await as(viewer).get(`/api/cavities/${fractionCavityId}/alerts`)).body.states
    expect(state).toEqual([expect.objectContaining({ kind: 'fraction_below_target', breached: true, analysisId: firstBreach.analysisId })])

    // Still below: the breach goes on, no new e-mail.
    await analyse(fractionCavityId, { orderPowers: [0.5, 0.3, 0.15, 0.05] })
    expect(await alertMailsTo(viewer)).toHaveLength(1)

    // Back above the target: cleared, announced in-app only.
    await analyse(fractionCavityId, { orderPowers: [0.82, 0.1, 0.05, 0.03] })
    expect(await alertMailsTo(viewer)).toHaveLength(1)
    expect((await as(viewer).get(`/api/cavities/${fractionCavityId}/alerts`)).body.states[0].breached).toBe(false)

    // A new breach after the recovery: one e-mail again.
    const secondBreach = await analyse(fractionCavityId, { orderPowers: [0.6, 0.2, 0.15, 0.05] })
    for (const actor of [experimenter, viewer]) {
      const mails = await alertMailsTo(actor)
      expect(mails).toHaveLength(2)
      expect(mails[0].text).toContain(`/analyses/${secondBreach.analysisId}`) // newest first
    }
  })

  it('when alerts fire then watchers see in-app notifications and can mark them read', async () => {
    const listed = await as(viewer).get('/api/notifications')
    expect(listed.status).toBe(200)
    const kinds = listed.body.notifications.map((item: { kind: string }) => item.kind)
    expect(kinds).toEqual(['fraction_below_target', 'fraction_below_target_recovered', 'fraction_below_target'])
    expect(listed.body.unreadCount).toBe(3)
    const newest = listed.body.notifications[0]
    expect(newest).toMatchObject({ cavityId: fractionCavityId, readAt: null, details: { threshold: 0.7 } })
    expect(newest.details.value).toBeLessThan(0.7)

    expect((await as(experimenter).post(`/api/notifications/${newest.id}/read`)).status).toBe(404) // not theirs
    const read = await as(viewer).post(`/api/notifications/${newest.id}/read`)
    expect(read.status).toBe(200)
    expect(read.body.notification.readAt).not.toBeNull()
    const unread = await as(viewer).get('/api/notifications?unread=true')
    expect(unread.body.notifications).toHaveLength(2)
    expect(unread.body.unreadCount).toBe(2)
    expect((await as(viewer).post('/api/notifications/read-all')).body.updated).toBe(2)
    expect((await as(technician).get('/api/notifications')).body.notifications).toEqual([])
  })

  it('when the finesse falls more than the threshold below the 30-day median then watchers get one e-mail', async () => {
    // Three readings at finesse 400 make the median; the generator sets the finesse (shared/sim).
    for (let index = 0; index < 3; index++) await analyse(finesseCavityId, { finesse: 400 })
    expect(await alertMailsTo(viewer)).toHaveLength(2) // only the fraction alerts so far

    // Not drained by the test: the dispatcher's own poll (every 2 s) sends it.
    const low = await analyse(finesseCavityId, { finesse: 250 }, { drain: false })
    // 250 is 37.5 % below 400: past the 20 % threshold.
    expect(low.finesse).toBeLessThan(400 * 0.8)
    await waitForMail(server.db, emails.get(viewer)!, { subject: /finesse/, timeoutMs: 10_000 })
    const mails = (await alertMailsTo(viewer)).filter((mail) => mail.subject.includes('finesse'))
    expect(mails).toHaveLength(1)
    expect(mails[0].subject).toMatch(/Alert finesse cavity: finesse \d+ is \d+ % below its 30-day median \d+/)
    expect(mails[0].text).toContain('20 % below the median')

    await analyse(finesseCavityId, { finesse: 240 })
    expect((await alertMailsTo(viewer)).filter((mail) => mail.subject.includes('finesse'))).toHaveLength(1)
  })

  it('when the weekly digest runs then each lead gets it through the mail capture with every cavity and the week’s maintenance', async () => {
    const entry = await as(lead).post(`/api/cavities/${finesseCavityId}/log-entries`).send({ kind: 'cleaning', text: 'Cleaned the input mirror after the finesse alert.' })
    expect(entry.status).toBe(201)
    const otherLead = await createActor(server.db, 'lead')
    const otherLeadEmail = ((await server.db('users').where({ id: otherLead.id }).first('email')) as { email: string }).email

    const sent = await sendWeeklyDigest({ db: server.db, mailer: server.mailer, baseUrl: server.url })
    expect(sent.recipients.sort()).toEqual([emails.get(lead), otherLeadEmail].sort())
    expect(sent.failed).toEqual([])
    expect(await listOutbox(server.db, { to: emails.get(viewer) }).then((mails) => mails.filter((mail) => /digest/.test(mail.subject)))).toHaveLength(0)

    const mail = await waitForMail(server.db, emails.get(lead)!, { subject: /weekly digest/ })
    expect(mail.subject).toBe(sent.subject)
    expect(mail.subject).toMatch(/0 of 2 cavities on target, 1 below/)
    const lines = mail.text.split('\n')
    const fractionLine = lines.find((line) => line.startsWith('Alert fraction cavity'))
    expect(fractionLine).toMatch(/\d+\.\d %.*70\.0 %\s+BELOW/)
    const finesseLine = lines.find((line) => line.startsWith('Alert finesse cavity'))
    expect(finesseLine).toMatch(/no target/)
    expect(finesseLine).toMatch(/\d{4}-\d{2}-\d{2} Cleaning$/)
    expect(mail.text).toContain('Alerts in breach now: Alert finesse cavity (finesse drop); Alert fraction cavity (TEM00 below target).')
    expect(mail.text).toMatch(/Maintenance this week:\n {2}\d{4}-\d{2}-\d{2} {2}Alert finesse cavity — Cleaning \(Test lead \d+\): Cleaned the input mirror/)
    expect(mail.text).toContain(`The overview: ${server.url}/`)
  })

  it('when the server runs then the digest is scheduled weekly in the job queue', async () => {
    const schedules = (await server.db('pgboss.schedule').select('name', 'cron', 'options')) as Array<{ name: string; cron: string; options: { tz?: string } }>
    expect(schedules).toEqual([expect.objectContaining({ name: 'weekly-digest', cron: '0 7 * * 1' })])
    expect(schedules[0].options.tz).toBe('UTC')
  })
  it('when a reading is in doubt then its TEM00 fraction neither raises nor clears the target alert', async () => {
    // Back above the target first (cleared, no mail).
    await analyse(fractionCavityId, { orderPowers: [0.85, 0.08, 0.05, 0.02] })
    const before = (await as(viewer).get(`/api/cavities/${fractionCavityId}/alerts`)).body.states[0]
    expect(before.breached).toBe(false)
    const mailsBefore = (await alertMailsTo(viewer)).length
    // Only TEM00 and orders 2 and 3: the spectrum reads as well mirrored, and the result says so (ambiguous_reading).
    const doubtful = await analyse(fractionCavityId, { orderPowers: [0.3, 0, 0.45, 0.25], fsrCount: 3.2, seed: 21 })
    expect(doubtful.fraction).toBeLessThan(0.7)
    const warnings = (await as(viewer).get(`/api/analyses/${doubtful.analysisId}`)).body.result.warnings.map((w: { code: string }) => w.code)
    expect(warnings).toContain('ambiguous_reading')
    const after = (await as(viewer).get(`/api/cavities/${fractionCavityId}/alerts`)).body.states[0]
    expect(after.breached).toBe(false)
    expect(after.analysisId).toBe(before.analysisId)
    expect(await alertMailsTo(viewer)).toHaveLength(mailsBefore)
  })
})

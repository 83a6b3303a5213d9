/**
 * The demo lab as a lead first sees it (issue 7): every demo cavity in the overview, the seeded
 * maintenance log with the filter cavity's cleaning between its scans 7 and 8, alert states judged
 * from the seeded analyses without sending mail, and the weekly digest of the demo lab.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { sendWeeklyDigest } from '../../server/alerts/weeklyDigest'
import { listOutbox } from '../../server/mail/outboxData'
import { createActor, type TestActor } from '../support/actors'
import { startTestServer, type TestServer } from '../support/testServer'

describe('the demo lab overview and log', () => {
  let server: TestServer
  let lead: TestActor

  beforeAll(async () => {
    server = await startTestServer({}, { seedDemo: true })
    lead = await createActor(server.db, 'lead')
  })
  afterAll(() => server?.close())

  it('when the demo is seeded then the overview lists every demo cavity with sparklines, targets and the breach of the 532 nm cavity', async () => {
    const response = await request(server.url).get('/api/overview').set('Authorization', lead.authorization)
    expect(response.status).toBe(200)
    const rows = response.body.cavities as Array<{ name: string; sparkline: unknown[]; targetStatus: string; activeAlerts: string[]; lastMaintenance: { kind: string } | null }>
    expect(rows.map((row) => row.name)).toEqual(['FLT-780 filter cavity', 'REF-1064 reference cavity', 'SHG-532 enhancement cavity'])
    for (const row of rows) expect(row.sparkline.length).toBeGreaterThanOrEqual(5)
    const byName = new Map(rows.map((row) => [row.name, row]))
    // Seeded at 69 % in TEM00 (db/seeds/seedDemoLab.ts) against the 75 % target the demo log raised it to.
    expect(byName.get('SHG-532 enhancement cavity')).toMatchObject({ targetStatus: 'below', activeAlerts: ['fraction_below_target'], lastMaintenance: { kind: 'inspection' } })
    expect(byName.get('FLT-780 filter cavity')).toMatchObject({ targetStatus: 'met', activeAlerts: [], lastMaintenance: { kind: 'realignment' } })
    await server.alertMail.drain()
    expect((await listOutbox(server.db)).filter((mail) => mail.subject.startsWith('Cavitrace alert'))).toEqual([])
  })

  it('when the filter cavity log is read then the cleaning shows the finesse recovering across it', async () => {
    const cavities = (await request(server.url).get('/api/cavities').set('Authorization', lead.authorization)).body.cavities as Array<{ id: string; name: string }>
    const filter = cavities.find((cavity) => cavity.name === 'FLT-780 filter cavity')!
    const entries = (await request(server.url).get(`/api/cavities/${filter.id}/log-entries?kind=cleaning`).set('Authorization', lead.authorization)).body.entries
    expect(entries).toHaveLength(1)
    const [cleaning] = entries
    expect(cleaning.author.name).toBe('Teodor Marrowick')
    expect(cleaning.traces.map((trace: { fileName: string }) => trace.fileName)).toEqual(['scan-007.csv', 'scan-008.csv'])
    // The generator made scan 7 at finesse 268 and scan 8 at 395, and 74 % → 80 % in TEM00 (seedDemoLab.ts).
    expect(cleaning.beforeAfter.before.finesse).toBeGreaterThan(230)
    expect(cleaning.beforeAfter.before.finesse).toBeLessThan(310)
    expect(cleaning.beforeAfter.change.finesse).toBeGreaterThan(80)
    expect(cleaning.beforeAfter.change.fundamentalFraction).toBeGreaterThan(0.03)
    expect(cleaning.beforeAfter.change.linewidthHz).toBeLessThan(0) // a higher finesse is a narrower line
  })

  it('when the digest is sent for the demo lab then the demo lead gets the three cavities and the breach', async () => {
    const sent = await sendWeeklyDigest({ db: server.db, mailer: server.mailer, baseUrl: server.url })
    expect(sent.recipients).toContain('lead@demo.cavitrace.test')
    expect(sent.subject).toBe('Cavitrace weekly digest, North Wing Optics Lab (demo): 2 of 3 cavities on target, 1 below')
    const [mail] = await listOutbox(server.db, { to: 'lead@demo.cavitrace.test' })
    expect(mail.text).toContain('Alerts in breach now: SHG-532 enhancement cavity (TEM00 below target).')
    expect(mail.text).toMatch(/^SHG-532 enhancement cavity .*75\.0 % +BELOW/m)
  })
})

import { statSync } from 'node:fs'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { computeCavityModel } from '../../shared/cavity'
import { demoPassword, demoPeople } from '../../shared/auth/demoAccounts'
import { createActor, type TestActor } from '../support/actors'
import { launchBrowser, type TestBrowser } from '../support/browser'
import { generatedTraceCsv, testCavityGeometry, writeTempFile } from '../support/traceFiles'
import { startTestServer, type TestServer } from '../support/testServer'

const gouyOneWayRad = computeCavityModel(testCavityGeometry).gouyOneWayRad

/** A generated trace of the test cavity with the given share of power per order (invented data). */
function traceCsv(orderPowers: number[], seed: number): string {
  return generatedTraceCsv({ gouyOneWayRad, orderPowers, seed })
}

async function waitForDone(server: TestServer, actor: TestActor, id: string): Promise<{ status: string; result: { fundamentalFraction: number } | null }> {
  const deadline = Date.now() + 30_000
  for (;;) {
    const response = await request(server.url).get(`/api/analyses/${id}`).set('Authorization', actor.authorization)
    if (response.body.status === 'done' || response.body.status === 'failed') return response.body
    if (Date.now() > deadline) throw new Error(`analysis ${id} still ${response.body.status}`)
    await new Promise((resolve) => setTimeout(resolve, 100))
  }
}

describe('the tuning loop in a real browser', () => {
  let server: TestServer
  let browser: TestBrowser
  let lead: TestActor
  let cavityId: string
  let previousFraction: number
  const experimenter = demoPeople.find((person) => person.role === 'experimenter')!

  beforeAll(async () => {
    server = await startTestServer({}, { seedDemo: true })
    lead = await createActor(server.db, 'lead')
    const created = await request(server.url)
      .post('/api/cavities')
      .set('Authorization', lead.authorization)
      .send({ name: 'Bench 3 reference cavity', location: 'Table 3, west end', ...testCavityGeometry, reflectivity1: 0.995, reflectivity2: 0.995, targetFundamentalFraction: 0.85 })
    expect(created.status).toBe(201)
    cavityId = created.body.cavity.id
    // One trace before the session, so the first upload in the browser has a previous trace to compare with.
    const earlier = await request(server.url)
      .post(`/api/cavities/${cavityId}/traces`)
      .set('Authorization', lead.authorization)
      .field('note', 'before touching anything')
      .attach('file', Buffer.from(traceCsv([0.7, 0.16, 0.1, 0.04], 11)), 'scan-000.csv')
    expect(earlier.status).toBe(202)
    const done = await waitForDone(server, lead, earlier.body.uploads[0].analysis.id)
    expect(done.status).toBe('done')
    previousFraction = done.result!.fundamentalFraction
    browser = await launchBrowser()
  })
  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })

  it('when the demo experimenter signs in and opens the cavity then the computed card, the order diagram and the history show', async () => {
    const { page } = browser
    await page.goto(`${server.url}/sign-in?next=/cavities`)
    await page.getByTestId('sign-in-email').fill(experimenter.email)
    await page.locator('#sign-in-password').fill(demoPassword)
    await page.getByTestId('sign-in-submit').click()
    await page.getByRole('heading', { name: 'Cavities' }).waitFor()
    // An experimenter may not create cavities (permission table), so the button is not offered.
    expect(await page.getByTestId('new-cavity').count()).toBe(0)
    await page.getByRole('link', { name: 'Bench 3 reference cavity' }).click()
    await page.getByTestId('cavity-name').waitFor()
    // FSR = c / 2L = 1.499 GHz for L = 100 mm (c exact by SI definition).
    expect(await page.getByTestId('model-fsr').innerText()).toBe('1.499\u00a0GHz')
    expect(await page.locator('[data-testid="order-diagram"] [data-order]').count()).toBe(6)
    await page.getByTestId('cavity-history').getByText('scan-000.csv').waitFor()
    expect(statSync(await browser.screenshot('cavity')).size).toBeGreaterThan(10_000)
  })

  it('when a trace is dropped on the tuning page then the result appears without reloading, with the change from the previous trace', async () => {
    const { page } = browser
    await page.getByTestId('tune-link').click()
    await page.getByTestId('live-status').getByText('Live').waitFor()
    const path = writeTempFile('scan-001.csv', traceCsv([0.82, 0.08, 0.07, 0.03], 12))
    await page.getByTestId('upload-note').fill('after moving the second lens +1 mm')
    let reloaded = false
    page.once('load', () => (reloaded = true))
    await page.getByTestId('trace-file-input').setInputFiles(path)
    await page.getByTestId('latest-result').getByText('scan-001.csv').waitFor({ timeout: 30_000 })
    expect(reloaded).toBe(false)
    const fraction = Number((await page.getByTestId('latest-fraction').innerText()).replace(/[^\d.]/g, '')) / 100
    expect(fraction).toBeGreaterThan(previousFraction)
    expect(await page.getByTestId('latest-change').innerText()).toMatch(/▲ \+\d+\.\d points from the previous trace/)
    expect(await page.getByTestId('latest-reading').innerText()).toContain('TEM00')
    expect(await page.getByTestId('session-traces').innerText()).toContain('after moving the second lens +1 mm')
  })

  it('when a lab script uploads through the API then the open tuning page shows it by itself', async () => {
    const { page } = browser
    const scripted = await request(server.url)
      .post(`/api/cavities/${cavityId}/traces`)
      .set('Authorization', lead.authorization)
      .field('note', 'scripted scan')
      .attach('file', Buffer.from(traceCsv([0.88, 0.05, 0.05, 0.02], 13)), 'scan-002.csv')
    expect(scripted.status).toBe(202)
    await page.getByTestId('latest-result').getByText('scan-002.csv').waitFor({ timeout: 30_000 })
    await page.locator('[data-testid="session-trend"] canvas').waitFor()
    expect(statSync(await browser.screenshot('tuning')).size).toBeGreaterThan(10_000)
  })

  it('when the full analysis is opened then the trace is drawn with every resonance labelled by its order', async () => {
    const { page } = browser
    await page.getByTestId('latest-analysis-link').click()
    await page.getByTestId('analysis-figures').waitFor()
    const chart = page.getByTestId('trace-chart')
    await chart.locator('canvas').waitFor()
    await page.waitForFunction(() => (document.querySelector('[data-testid="trace-chart"]')?.getAttribute('data-markers') ?? '').length > 0)
    const labels = ((await chart.getAttribute('data-markers')) ?? '').split(' ')
    // Orders 0, 1 and 2 were generated with visible power, so each must be labelled at least once.
    for (const order of ['0', '1', '2']) expect(labels).toContain(order)
    const tableText = await page.getByTestId('peak-table').innerText()
    expect(tableText).toContain('carrier')
    const shares = await page.getByTestId('order-shares').innerText()
    expect(shares).toContain('TEM00')
    // Each share comes with its standard error from the line model's covariance.
    expect(shares).toMatch(/TEM00\s+[\d.]+\s%\s±\s[\d.]+/)
    // Calibrated axis: switching to FSR units keeps the markers.
    await page.getByTestId('axis-mode').getByText('FSR').click()
    await page.waitForFunction(() => (document.querySelector('[data-testid="trace-chart"]')?.getAttribute('data-markers') ?? '').includes('0'))
    await page.getByTestId('axis-mode').getByText('Seconds').click()
    expect(statSync(await browser.screenshot('analysis')).size).toBeGreaterThan(10_000)
    // A clear reading carries no doubt beside its headline.
    expect(await page.getByTestId('reading-doubt').count()).toBe(0)
  })

  it('when a trace reads as well mirrored then the headline says the reading is in doubt and names the other fraction', async () => {
    // Only TEM00 and orders 2 and 3 (30/45/25 %): read backwards, orders {0, 2, 3} are {3, 1, 0} at the same places.
    const { page } = browser
    const mirrored = await request(server.url)
      .post(`/api/cavities/${cavityId}/traces`)
      .set('Authorization', lead.authorization)
      .field('note', 'beam far off, lens moved')
      .attach('file', Buffer.from(generatedTraceCsv({ gouyOneWayRad, orderPowers: [0.3, 0, 0.45, 0.25], fsrCount: 3.2, seed: 21 })), 'scan-mirror.csv')
    expect(mirrored.status).toBe(202)
    const analysisId = mirrored.body.uploads[0].analysis.id
    expect((await waitForDone(server, lead, analysisId)).status).toBe('done')
    await page.goto(`${server.url}/analyses/${analysisId}`)
    const doubt = page.getByTestId('reading-doubt')
    await doubt.waitFor()
    expect(await doubt.innerText()).toMatch(/^In doubt: another reading of the resonances explains them about as well.* Or about [\d.]+\s%\.$/)
    expect(await page.getByText('ambiguous_reading').count()).toBeGreaterThan(0)
    expect(statSync(await browser.screenshot('analysis-doubt')).size).toBeGreaterThan(10_000)
    // On the tuning page the newest result says the same, and the target is neither met nor missed.
    await page.goto(`${server.url}/cavities/${cavityId}`)
    await page.getByTestId('tune-link').click()
    await page.getByTestId('latest-result').getByText('scan-mirror.csv').waitFor()
    expect(await page.getByTestId('latest-doubt').innerText()).toMatch(/^In doubt: another reading/)
    expect(await page.getByTestId('latest-result').innerText()).toContain('cannot tell')
    expect(statSync(await browser.screenshot('tuning-doubt')).size).toBeGreaterThan(10_000)
  })
})

/**
 * One-column exports in a real browser (issue 13): without an interval the tuning page says why the analysis failed;
 * the re-analyse form takes the interval; the cavity remembers it, so the next such export is read at once, and the
 * upload form offers a field of its own. Invented cavity and person.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createPerson, testPassword } from '../api/auth/accountsTestKit'
import { createActor } from '../support/actors'
import { launchBrowser, type TestBrowser } from '../support/browser'
import { signInThroughPage } from '../support/signInPage'
import { oneColumnTraceCsv, testCavityGeometry, writeTempFile } from '../support/traceFiles'
import { startTestServer, type TestServer } from '../support/testServer'

describe('one-column exports in a real browser', () => {
  let server: TestServer
  let browser: TestBrowser
  let cavityId: string

  beforeAll(async () => {
    server = await startTestServer()
    const lead = await createActor(server.db, 'lead')
    cavityId = (await request(server.url).post('/api/cavities').set('Authorization', lead.authorization).send({ name: 'Bench 7 mode cleaner', ...testCavityGeometry })).body.cavity.id
    const person = await createPerson(server, 'experimenter', { name: 'Iva Sampler' })
    browser = await launchBrowser()
    await signInThroughPage(browser, server.url, person.email, testPassword)
  })
  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })

  it('when a one-column export is dropped without an interval then the failure says so inline, and the re-analyse form reads it with one', async () => {
    const { page } = browser
    await page.goto(`${server.url}/tuning/${cavityId}`)
    await page.getByTestId('live-status').getByText('Live').waitFor()
    await page.getByTestId('trace-file-input').setInputFiles(writeTempFile('bare-1.csv', oneColumnTraceCsv({ seed: 61 })))
    const reason = page.getByTestId('failed-reason')
    await reason.waitFor({ timeout: 30_000 })
    expect(await reason.innerText()).toContain('sample interval')
    await page.getByTestId('newest-failed').getByRole('link').click()
    await page.getByTestId('reanalyse-form').waitFor()
    await page.getByTestId('reanalyse-interval').fill('0.00001')
    await page.getByTestId('reanalyse-submit').click()
    await page.getByTestId('analysis-figures').waitFor({ timeout: 30_000 })
    expect(await page.getByTestId('analysis-status').innerText()).toContain('done')
    await browser.screenshot('one-column-reanalysed')
  })

  it('when the next one-column export is dropped then the remembered interval reads it, and a bad interval in the form is refused with a sentence', async () => {
    const { page } = browser
    await page.goto(`${server.url}/tuning/${cavityId}`)
    const field = page.getByTestId('upload-interval')
    await field.waitFor()
    expect(await field.getAttribute('placeholder')).toBe('0.00001 (remembered)')
    await page.getByTestId('trace-file-input').setInputFiles(writeTempFile('bare-2.csv', oneColumnTraceCsv({ seed: 62 })))
    await page.getByTestId('latest-result').getByText('bare-2.csv').waitFor({ timeout: 30_000 })

    await field.fill('10,5')
    await page.getByTestId('trace-file-input').setInputFiles(writeTempFile('bare-3.csv', oneColumnTraceCsv({ seed: 63 })))
    expect(await page.getByTestId('upload-interval-problem').innerText()).toMatch(/digits with a point/)
    expect(await page.getByTestId('session-traces').getByText('bare-3.csv').count()).toBe(0)
    // The one-column export is drawn with the remembered interval, labels and all.
    await page.waitForFunction(() => (document.querySelector('[data-testid="live-trace"] [data-testid="trace-chart"]')?.getAttribute('data-markers') ?? '').includes('0'))
    await browser.screenshot('one-column-tuning')
  })
})

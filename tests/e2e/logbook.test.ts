/**
 * The maintenance log in a real browser (issue 7): the demo technician writes an entry on a cavity's
 * page with a stored trace attached and a new trace uploaded, sees it in the panel and in the logbook
 * search, and finds its marker on the cavity's trend chart. Demo data: the invented demo lab; the
 * uploaded trace comes from the project's own generator.
 */
import { statSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { demoPassword, demoPeople } from '../../shared/auth/demoAccounts'
import { computeCavityModel } from '../../shared/cavity'
import { launchBrowser, type TestBrowser } from '../support/browser'
import { generatedTraceCsv, testCavityGeometry, writeTempFile } from '../support/traceFiles'
import { startTestServer, type TestServer } from '../support/testServer'

describe('the maintenance log as the demo technician', () => {
  let server: TestServer
  let browser: TestBrowser
  let cavityId: string
  const technician = demoPeople.find((person) => person.role === 'technician')!
  const text = 'Cleaned the input coupler after a dust alarm in the enclosure; drag wipe, no marks left.'

  beforeAll(async () => {
    server = await startTestServer({}, { seedDemo: true })
    // The demo reference cavity has the test geometry (1064 nm, 100 mm, flat / 500 mm) and no log entries yet.
    cavityId = ((await server.db('cavities').where({ name: 'REF-1064 reference cavity' }).first('id')) as { id: string }).id
    expect(((await server.db('log_entries').where({ cavity_id: cavityId }).count({ n: '*' })) as Array<{ n: string }>)[0].n).toBe('0')
    browser = await launchBrowser()
    const { page } = browser
    await page.goto(`${server.url}/sign-in?next=/cavities/${cavityId}`)
    await page.getByTestId('sign-in-email').fill(technician.email)
    await page.locator('#sign-in-password').fill(demoPassword)
    await page.getByTestId('sign-in-submit').click()
    await page.getByTestId('cavity-name').waitFor()
  })
  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })

  it('when the technician adds a cleaning entry with a stored trace and a new upload then the panel shows both attachments', async () => {
    const { page } = browser
    const panel = page.getByTestId('cavity-log-panel')
    await panel.getByText('Nothing logged yet').waitFor()
    // A technician may write the log but not set alert rules (permission table).
    expect(await page.getByTestId('save-alerts').count()).toBe(0)
    await panel.getByTestId('new-log-entry').click()
    const dialog = page.getByTestId('log-entry-dialog')
    await dialog.waitFor()
    await dialog.getByTestId('log-kind').click()
    await page.getByRole('option', { name: 'Cleaning' }).click()
    await dialog.getByTestId('log-text').fill(text)
    // Attach the newest stored trace of the cavity, picked from its history.
    await dialog.getByTestId('log-traces').click()
    const option = page.locator('.p-multiselect-overlay [role="option"]').first()
    const picked = ((await option.innerText()).split(' · ')[0] ?? '').trim()
    expect(picked).toMatch(/\.csv$/)
    await option.click()
    await dialog.getByText('What was done, and what was seen').click()
    // And upload a new one with the entry (a generated trace of this geometry: invented data).
    const gouyOneWayRad = computeCavityModel(testCavityGeometry).gouyOneWayRad
    const path = writeTempFile('after-cleaning.csv', generatedTraceCsv({ gouyOneWayRad, orderPowers: [0.9, 0.05, 0.04, 0.01], seed: 21 }))
    await dialog.getByTestId('log-files').setInputFiles(path)
    await dialog.getByTestId('log-save').click()
    await dialog.waitFor({ state: 'hidden' })

    const entry = panel.getByTestId('log-entry').first()
    await entry.getByText(text).waitFor()
    expect(await entry.getByText('Cleaning', { exact: true }).count()).toBe(1)
    const attachments = await entry.getByTestId('entry-traces').innerText()
    expect(attachments).toContain(picked)
    expect(attachments).toContain('after-cleaning.csv')
    expect(await entry.getByText('by Teodor Marrowick').count()).toBe(1)
    const stored = (await server.db('log_entries').where({ cavity_id: cavityId })) as Array<{ id: string; kind: string }>
    expect(stored.map((row) => row.kind)).toEqual(['cleaning'])
    expect(((await server.db('log_entry_traces').where({ entry_id: stored[0].id }).count({ n: '*' })) as Array<{ n: string }>)[0].n).toBe('2')
    expect(statSync(await browser.screenshot('logbook-cavity-panel')).size).toBeGreaterThan(20_000)
  })

  it('when the technician opens the cavity history then the entry is a marker on the trend chart with its text on hover', async () => {
    const { page } = browser
    await page.goto(`${server.url}/history/${cavityId}`)
    const chart = page.getByTestId('trend-fundamentalFraction')
    await chart.locator('canvas').waitFor()
    await page.waitForFunction(() => (document.querySelector('[data-testid="trend-fundamentalFraction"]')?.getAttribute('data-markers') ?? '').includes('Cleaning'))
    expect((await chart.getAttribute('data-markers'))?.split('|')).toEqual(['Cleaning'])
    expect(Number(await chart.getAttribute('data-points'))).toBeGreaterThanOrEqual(5)
    // The entry was written just now, so its marker sits at the right end of the range: sweep the pointer there.
    const box = (await chart.locator('.u-over').boundingBox())!
    let shown = ''
    for (let x = box.x + box.width - 1; x > box.x + box.width - 40 && !shown.includes(text); x -= 1) {
      await page.mouse.move(x, box.y + box.height / 2)
      shown = (await page.locator('[role="tooltip"]').allInnerTexts()).join(' ')
    }
    expect(shown).toContain(text)
    expect(statSync(await browser.screenshot('logbook-history-marker')).size).toBeGreaterThan(20_000)
  })

  it('when a new trace is analysed while the history is open then its point joins the charts by itself', async () => {
    const { page } = browser
    const before = Number(await page.getByTestId('trend-fundamentalFraction').getAttribute('data-points'))
    const csv = generatedTraceCsv({ gouyOneWayRad: computeCavityModel(testCavityGeometry).gouyOneWayRad, orderPowers: [0.92, 0.04, 0.03, 0.01], seed: 22 })
    const status = await page.evaluate(
      async ({ id, body }) => {
        const form = new FormData()
        form.append('file', new Blob([body], { type: 'text/csv' }), 'check-after-cleaning.csv')
        return (await fetch(`/api/cavities/${id}/traces`, { method: 'POST', body: form, credentials: 'same-origin' })).status
      },
      { id: cavityId, body: csv },
    )
    expect(status).toBe(202)
    await page.waitForFunction((count) => Number(document.querySelector('[data-testid="trend-fundamentalFraction"]')?.getAttribute('data-points')) === count + 1, before, { timeout: 30_000 })
    await page.getByTestId('history-table').getByText('check-after-cleaning.csv').waitFor()
  })

  it('when the logbook is searched for the entry’s words then only that entry is listed', async () => {
    const { page } = browser
    // All cavities come from one lab-wide request, not one request per cavity.
    const listRequests: string[] = []
    const onRequest = (sent: { url(): string }) => {
      const path = new URL(sent.url()).pathname
      if (path === '/api/log-entries' || /^\/api\/cavities\/[^/]+\/log-entries$/.test(path)) listRequests.push(path)
    }
    page.on('request', onRequest)
    await page.goto(`${server.url}/logbook`)
    await page.getByTestId('log-list').getByTestId('log-entry').first().waitFor()
    expect(await page.getByTestId('log-list').getByTestId('log-entry').count()).toBe(4) // three seeded + ours
    page.off('request', onRequest)
    expect(listRequests).toEqual(['/api/log-entries'])
    await page.getByTestId('log-search').fill('dust alarm')
    await page.waitForFunction(() => document.querySelectorAll('[data-testid="log-list"] [data-testid="log-entry"]').length === 1)
    expect(await page.getByTestId('log-list').innerText()).toContain('REF-1064 reference cavity')
    expect(statSync(await browser.screenshot('logbook-search')).size).toBeGreaterThan(10_000)
  })
})

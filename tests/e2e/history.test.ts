/**
 * A cavity's history, the side-by-side comparison and the printable report in a real browser (issue 7),
 * as the demo experimenter on the demo filter cavity: its cleaning and realignment are seeded between
 * scans 7–8 and 8–9 (db/seeds/seedDemoLogbook.ts). Demo data is invented.
 */
import { statSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { demoPassword, demoPeople } from '../../shared/auth/demoAccounts'
import { launchBrowser, type TestBrowser } from '../support/browser'
import { startTestServer, type TestServer } from '../support/testServer'

describe('history, comparison and report as the demo experimenter', () => {
  let server: TestServer
  let browser: TestBrowser
  const experimenter = demoPeople.find((person) => person.role === 'experimenter')!

  beforeAll(async () => {
    server = await startTestServer({}, { seedDemo: true })
    browser = await launchBrowser()
    const { page } = browser
    await page.goto(`${server.url}/sign-in?next=/history`)
    await page.getByTestId('sign-in-email').fill(experimenter.email)
    await page.locator('#sign-in-password').fill(demoPassword)
    await page.getByTestId('sign-in-submit').click()
    await page.getByTestId('history-picker').waitFor()
  })
  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })

  it('when the filter cavity is picked then three trend charts show its scans with the log entries marked and the target drawn', async () => {
    const { page } = browser
    await page.getByTestId('history-picker').getByText('FLT-780 filter cavity').click()
    await page.getByTestId('history-cavity').getByText('FLT-780 filter cavity').waitFor()
    for (const metric of ['fundamentalFraction', 'finesse', 'linewidthHz']) {
      const chart = page.getByTestId(`trend-${metric}`)
      await chart.locator('canvas').waitFor()
      await page.waitForFunction((id) => Number(document.querySelector(`[data-testid="trend-${id}"]`)?.getAttribute('data-points')) > 0, metric)
    }
    // Ten demo scans over four weeks, all inside the default 30 days; the two seeded entries in time order.
    expect(await page.getByTestId('trend-fundamentalFraction').getAttribute('data-points')).toBe('10')
    expect(await page.getByTestId('trend-finesse').getAttribute('data-markers')).toBe('Cleaning|Realignment')
    expect(await page.getByTestId('history-table').locator('tbody tr').count()).toBe(10)
    // The 7-day preset holds only the last scans, and the address keeps the choice.
    await page.getByTestId('history-range').getByText('7 days').click()
    await page.waitForFunction(() => Number(document.querySelector('[data-testid="trend-fundamentalFraction"]')?.getAttribute('data-points')) < 10)
    expect(new URL(page.url()).searchParams.get('range')).toBe('7d')
    const csv = await page.getByTestId('history-csv').getAttribute('href')
    // A rolling preset leaves the end open, so the export holds whatever is newest.
    expect(csv).toMatch(/\/api\/cavities\/[0-9a-f-]+\/history\.csv\?from=[^&]+$/)
    const response = await page.request.get(`${server.url}${csv}`)
    expect(response.status()).toBe(200)
    await page.getByTestId('history-range').getByText('30 days').click()
    await page.waitForFunction(() => document.querySelector('[data-testid="trend-fundamentalFraction"]')?.getAttribute('data-points') === '10')
    expect(statSync(await browser.screenshot('history')).size).toBeGreaterThan(30_000)
  })

  it('when the scans before and after the cleaning are ticked then the comparison shows the finesse recovering and both traces overlaid', async () => {
    const { page } = browser
    const table = page.getByTestId('history-table')
    for (const name of ['scan-007.csv', 'scan-008.csv']) await table.locator('tr', { hasText: name }).getByTestId('history-pick').click()
    expect(await page.getByTestId('picked-count').innerText()).toBe('2 of 2 picked')
    await page.getByTestId('open-compare').click()
    const figures = page.getByTestId('comparison-figures')
    await figures.waitFor()
    // Older analysis first: A is the scan before the cleaning.
    expect(await figures.locator('thead th').nth(1).innerText()).toContain('scan-007.csv')
    const finesseRow = await figures.locator('tr', { hasText: 'Finesse' }).innerText()
    expect(finesseRow).toContain('▲')
    await page.getByTestId('trace-overlay').locator('canvas').waitFor({ timeout: 30_000 })
    expect(statSync(await browser.screenshot('compare')).size).toBeGreaterThan(30_000)
  })

  it('when an analysis is printed then navigation and controls are gone and the full safety caution heads the report', async () => {
    const { page } = browser
    await page.getByTestId('comparison-figures').locator('thead th').nth(2).getByRole('link').click()
    await page.getByTestId('analysis-figures').waitFor()
    await page.getByTestId('trace-chart').locator('canvas').waitFor()
    expect(await page.getByTestId('print-report').isVisible()).toBe(true)
    expect(await page.getByTestId('report-header').isVisible()).toBe(false)
    await page.emulateMedia({ media: 'print' })
    try {
      expect(await page.getByTestId('report-header').isVisible()).toBe(true)
      expect(await page.getByTestId('report-header').getByTestId('safety-notice').innerText()).toContain('Class 3B or Class 4')
      expect(await page.locator('aside[aria-label="Main navigation"]').isVisible()).toBe(false)
      expect(await page.getByTestId('print-report').isVisible()).toBe(false)
      expect(await page.getByTestId('analysis-figures').isVisible()).toBe(true)
      // The peak table prints every row: no scroll box hides the ones past the first screenful.
      const peakRows = await page.getByTestId('peak-table').locator('tbody tr').count()
      expect(peakRows).toBeGreaterThan(12)
      const clipped = await page.evaluate(() => {
        const box = document.querySelector('[data-testid="peak-table"] .p-datatable-table-container')
        return box ? box.scrollHeight - box.clientHeight : -1
      })
      expect(clipped).toBe(0)
      await page.setViewportSize({ width: 794, height: 1123 }) // A4 at 96 dpi
      expect(statSync(await browser.screenshot('report-print')).size).toBeGreaterThan(30_000)
    } finally {
      await page.emulateMedia({ media: 'screen' })
      await page.setViewportSize({ width: 1280, height: 800 })
    }
  })

  it('when an analysis of the astigmatic demo cavity is opened then the split orders are named beside the Gouy phase', async () => {
    // The demo enhancement cavity is generated with orders split by astigmatism (db/seeds/seedDemoLab.ts).
    const row = (await server
      .db('analyses as a')
      .join('cavities as c', 'c.id', 'a.cavity_id')
      .where({ 'c.name': 'SHG-532 enhancement cavity', 'a.status': 'done' })
      .orderBy('a.created_at', 'desc')
      .first('a.id')) as { id: string }
    const { page } = browser
    await page.goto(`${server.url}/analyses/${row.id}`)
    await page.getByTestId('analysis-figures').waitFor()
    expect(await page.getByTestId('order-split').innerText()).toMatch(/orders split by [\d.]+\sMHz \(astigmatism\)/)
    expect(await page.getByText(/The transverse orders are split/).count()).toBe(1)
    expect(statSync(await browser.screenshot('analysis-split')).size).toBeGreaterThan(30_000)
  })
})

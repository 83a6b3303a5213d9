/**
 * The lens planner in a real browser (issue 8): as the demo experimenter, open the demo 1064 nm reference cavity's
 * planner, enter the laser's beam, get ranked arrangements from the demo kit, see the beam along the path and the
 * coupling map, pick another arrangement, save a plan and open its printable page; the kit page and the cavity page's
 * plan list. The lab, its kit and its people are invented demo data.
 */
import { statSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { demoPassword, demoPeople } from '../../shared/auth/demoAccounts'
import { launchBrowser, type TestBrowser } from '../support/browser'
import { writeTempFile } from '../support/traceFiles'
import { startTestServer, type TestServer } from '../support/testServer'

describe('the lens planner in a real browser', () => {
  let server: TestServer
  let browser: TestBrowser
  const experimenter = demoPeople.find((person) => person.role === 'experimenter')!
  const technician = demoPeople.find((person) => person.role === 'technician')!

  beforeAll(async () => {
    server = await startTestServer({}, { seedDemo: true })
    browser = await launchBrowser()
  })
  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })

  it('when the demo experimenter plans the reference cavity then ranked solutions, the beam along the path and the coupling map show', async () => {
    const { page } = browser
    await page.goto(`${server.url}/sign-in?next=/planner`)
    await page.getByTestId('sign-in-email').fill(experimenter.email)
    await page.locator('#sign-in-password').fill(demoPassword)
    await page.getByTestId('sign-in-submit').click()
    await page.getByRole('heading', { name: 'Lens planner' }).waitFor()
    await page.getByTestId('planner-picker').getByText('REF-1064 reference cavity').click()
    await page.getByTestId('planner-cavity').getByText('REF-1064 reference cavity').waitFor()
    // Plano-concave, L = 100 mm, R2 = 500 mm at 1064 nm: w0² = (λ/π) √(L (R − L)) gives 260 µm on the flat mirror
    // (Kogelnik & Li, Appl. Opt. 5, 1550 (1966)).
    expect(await page.getByTestId('planner-target').innerText()).toContain('eigenmode waist 260')

    // Asking with no waist names the missing field instead of sending anything.
    await page.getByTestId('find-lenses').click()
    expect(await page.getByTestId('form-errors').innerText()).toContain('Fill in the waist radius')

    await page.locator('#beam-waist-x').fill('350')
    await page.locator('#beam-waist-x').press('Tab')
    await page.locator('#beam-waist-x-position').fill('-40')
    await page.locator('#beam-waist-x-position').press('Tab')
    await page.getByTestId('find-lenses').click()
    await page.getByTestId('plan-verdict').waitFor({ timeout: 30_000 })
    expect(await page.getByTestId('form-errors').count()).toBe(0)
    expect(await page.getByTestId('plan-verdict').innerText()).toMatch(/arrangements? from the kit reach the 95\.0 % target|Nothing in the kit reaches/)
    const rows = page.getByTestId('plan-solutions').locator('tbody tr')
    expect(await rows.count()).toBeGreaterThanOrEqual(5)
    // Ranked: the first row holds a coupling shown in percent and a worst case.
    expect(await rows.first().innerText()).toMatch(/\d+\.\d+ %/)
    await page.locator('[data-testid="beam-path-chart"] canvas').first().waitFor()
    expect(Number(await page.getByTestId('beam-path-chart').getAttribute('data-lenses'))).toBeGreaterThanOrEqual(1)
    const map = page.getByTestId('coupling-map')
    await map.waitFor()
    expect(Number(await map.getAttribute('data-cells'))).toBeGreaterThan(1000)
    expect(await page.getByTestId('ideal-lenses').innerText()).toMatch(/f = \d+ mm at/)
    expect(statSync(await browser.screenshot('planner')).size).toBeGreaterThan(20_000)
  })

  it('when the beam is given as measured radii then the fitted waist, its uncertainty and the solutions show', async () => {
    const { page } = browser
    // Radii from the ISO 11146-1 hyperbola w(z)² = w0² + (λ/(π w0))² (z − z0)² for w0 = 300 µm at z0 = 150 mm,
    // M² = 1 (invented beam), rounded to 0.01 µm as a profiler would print them.
    const w0Mm = 0.3
    const zRMm = (Math.PI * w0Mm * w0Mm) / 1064e-6
    const zMm = [0, 60, 120, 180, 240, 300]
    await page.getByTestId('beam-kind').getByText('Measured radii').click()
    for (const [index, z] of zMm.entries()) {
      const radiusUm = 1000 * w0Mm * Math.sqrt(1 + ((z - 150) / zRMm) ** 2)
      await page.locator(`#measured-z-${index}`).fill(String(z))
      await page.locator(`#measured-x-${index}`).fill(radiusUm.toFixed(2))
      await page.locator(`#measured-x-${index}`).press('Tab')
    }
    await page.getByTestId('find-lenses').click()
    await page.getByTestId('beam-fit').waitFor({ timeout: 30_000 })
    const fit = await page.getByTestId('beam-fit').innerText()
    expect(fit).toMatch(/300(\.\d)? µm ± /)
    expect(fit).toMatch(/150(\.\d)? mm ± /)
    expect(await page.getByTestId('plan-solutions').locator('tbody tr').count()).toBeGreaterThanOrEqual(5)
    expect(statSync(await browser.screenshot('planner-measured')).size).toBeGreaterThan(20_000)
  })

  it('when another arrangement is picked then the pictures follow it, and it can be saved and printed', async () => {
    const { page } = browser
    const rows = page.getByTestId('plan-solutions').locator('tbody tr')
    await rows.nth(1).click()
    await page.getByText('Beam along the path').locator('..').getByText('arrangement 2').waitFor({ timeout: 30_000 })
    await page.getByTestId('plan-note').fill('second choice: L1 on the short rail')
    await page.getByTestId('save-plan').click()
    await page.getByTestId('plan-saved').waitFor()
    await page.getByTestId('cavity-plans').getByText('second choice: L1 on the short rail').waitFor()
    await page.getByTestId('plan-saved').getByRole('link').click()
    await page.getByTestId('plan-title').waitFor()
    expect(await page.getByTestId('plan-lenses').locator('tbody tr').count()).toBeGreaterThanOrEqual(1)
    expect(await page.getByTestId('plan-coupling').innerText()).toMatch(/\d+\.\d+ %/)
    await page.getByTestId('safety-notice').waitFor()
    // The demo lab has finished scans of this cavity, so the mismatch reading shows.
    await page.getByTestId('mismatch-family').waitFor({ timeout: 15_000 })
    expect(await page.getByTestId('mismatch-family').innerText()).toContain('power alone cannot tell which')
    expect(statSync(await browser.screenshot('planner-plan')).size).toBeGreaterThan(20_000)
    await page.emulateMedia({ media: 'print' })
    expect(await page.getByTestId('plan-print').isVisible()).toBe(false)
    expect(statSync(await browser.screenshot('planner-plan-print')).size).toBeGreaterThan(10_000)
    await page.emulateMedia({ media: 'screen' })
  })

  it('when the experimenter opens the lens kit then the demo kit is listed and exportable, but not editable by this role', async () => {
    const { page } = browser
    await page.goto(`${server.url}/planner/kit`)
    await page.getByTestId('lens-table').getByText('PCX-100', { exact: true }).waitFor()
    expect(await page.getByTestId('lens-table').locator('tbody tr').count()).toBeGreaterThanOrEqual(30)
    expect(await page.getByTestId('kit-export').getAttribute('href')).toBe('/api/lenses.csv')
    expect(await page.getByTestId('kit-add').count()).toBe(0)
    expect(statSync(await browser.screenshot('planner-kit')).size).toBeGreaterThan(10_000)
  })

  it('when the demo technician edits the kit then a lens added in the dialog and a CSV import show, and a bad CSV names its line', async () => {
    const second = await launchBrowser()
    try {
      const { page } = second
      await page.goto(`${server.url}/sign-in?next=/planner/kit`)
      await page.getByTestId('sign-in-email').fill(technician.email)
      await page.locator('#sign-in-password').fill(demoPassword)
      await page.getByTestId('sign-in-submit').click()
      await page.getByTestId('lens-table').getByText('PCX-100', { exact: true }).waitFor()
      await page.getByTestId('kit-add').click()
      await page.getByTestId('lens-label').fill('E2E-88')
      await page.locator('#lens-focal').fill('88')
      await page.locator('#lens-focal').press('Tab')
      await page.getByTestId('lens-save').click()
      await page.getByTestId('lens-table').getByText('E2E-88', { exact: true }).waitFor()

      await page.getByTestId('kit-import-file').setInputFiles(writeTempFile('kit-import.csv', 'label,focal_length_mm,count\nE2E-IMP,-60,2\n'))
      expect(await page.getByTestId('kit-notice').innerText()).toContain('1 lens added, 0 updated')
      await page.getByTestId('lens-table').getByText('E2E-IMP', { exact: true }).waitFor()
      await page.getByTestId('kit-import-file').setInputFiles(writeTempFile('kit-bad.csv', 'label,focal_length_mm\nE2E-BAD,zero\n'))
      await page.getByTestId('kit-notice').getByText('line 2').waitFor()
      expect(await page.getByTestId('kit-notice').innerText()).toContain('Nothing was imported')
      expect(statSync(await second.screenshot('planner-kit-technician')).size).toBeGreaterThan(10_000)
    } finally {
      await second.close()
    }
  })

  it('when the cavity page is opened then its lens plans are listed, the demo plan among them', async () => {
    const { page } = browser
    await page.goto(`${server.url}/cavities`)
    await page.getByRole('link', { name: 'REF-1064 reference cavity' }).click()
    const plans = page.getByTestId('cavity-plans')
    await plans.getByText('Demo plan').waitFor()
    expect(await plans.locator('li').count()).toBe(2)
  })
})

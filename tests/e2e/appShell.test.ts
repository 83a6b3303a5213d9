import { existsSync, statSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { demoPassword, demoPeople } from '../../shared/auth/demoAccounts'
import { launchBrowser, type TestBrowser } from '../support/browser'
import { startTestServer, type TestServer } from '../support/testServer'

describe('the app shell in a real browser', () => {
  let server: TestServer
  let browser: TestBrowser
  const fontRequests: string[] = []

  beforeAll(async () => {
    server = await startTestServer({}, { seedDemo: true })
    browser = await launchBrowser()
    browser.page.on('request', (req) => {
      if (/\.(woff2?|ttf)(\?|$)/.test(req.url())) fontRequests.push(req.url())
    })
    // Every area needs a signed-in person now; the viewer sees the overview.
    const viewer = demoPeople.find((person) => person.role === 'viewer')!
    await browser.page.goto(`${server.url}/sign-in`)
    await browser.page.getByTestId('sign-in-email').fill(viewer.email)
    await browser.page.locator('#sign-in-password').fill(demoPassword)
    await browser.page.getByTestId('sign-in-submit').click()
    await browser.page.getByTestId('user-menu').waitFor()
  })
  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })

  it('when the overview loads then the title, the bundled font and the service status show', async () => {
    const { page } = browser
    await page.goto(`${server.url}/`)
    await page.getByRole('heading', { name: 'Lab overview' }).waitFor()
    expect(await page.title()).toBe('Cavitrace')

    await page.evaluate(() => document.fonts.ready)
    const family = await page.evaluate(() => getComputedStyle(document.body).fontFamily)
    expect(family).toMatch(/^"?IBM Plex Sans"?/)
    // The face is really loaded (not a fallback), and it came from this server, not the internet.
    expect(await page.evaluate(() => document.fonts.check('16px "IBM Plex Sans"') && [...document.fonts].some((f) => f.family.includes('IBM Plex Sans') && f.status === 'loaded'))).toBe(true)
    expect(fontRequests.length).toBeGreaterThan(0)
    expect(fontRequests.every((url) => url.startsWith(server.url))).toBe(true)

    await page.getByText('Service ok').waitFor()
    const shot = await browser.screenshot('overview')
    expect(statSync(shot).size).toBeGreaterThan(10_000)
  })

  it('when the safety strip is clicked from any page then the laser and high-voltage caution shows', async () => {
    const { page } = browser
    await page.goto(`${server.url}/history`)
    await page.getByTestId('safety-strip').click()
    await page.getByRole('heading', { name: 'Laser and high-voltage safety' }).waitFor()
    const text = await page.getByTestId('safety-notice').innerText()
    expect(text).toContain('Class 3B or Class 4')
    expect(text).toContain('150 V')
    expect(text).toContain('laser safety officer')
    expect(text).toMatch(/IEC 60825-1/)
    expect(existsSync(await browser.screenshot('safety'))).toBe(true)
  })

  it('when an unknown address is opened then the not-found page shows with the caution still reachable', async () => {
    const { page } = browser
    await page.goto(`${server.url}/no/such/page`)
    await page.getByRole('heading', { name: 'Page not found' }).waitFor()
    expect(await page.getByTestId('safety-strip').isVisible()).toBe(true)
    expect(await page.title()).toBe('Not found · Cavitrace')
    await browser.screenshot('not-found')
  })
})

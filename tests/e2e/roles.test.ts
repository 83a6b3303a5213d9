/**
 * Sign in as each demo person in a real browser and see only the menus their role may use — the
 * expectation read from the one permission table (shared/auth/permissions.ts) via the app areas.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { can } from '../../shared/auth/permissions'
import { demoPassword, demoPeople } from '../../shared/auth/demoAccounts'
import { appAreas } from '../../src/navigation'
import { launchBrowser, type TestBrowser } from '../support/browser'
import { startTestServer, type TestServer } from '../support/testServer'

describe('menus by role in a real browser', () => {
  let server: TestServer
  let browser: TestBrowser

  beforeAll(async () => {
    server = await startTestServer({}, { seedDemo: true })
    browser = await launchBrowser()
  })
  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })

  it('when signed out then any page leads to sign-in, while the safety page stays open', async () => {
    const { page } = browser
    await page.goto(`${server.url}/history`)
    await page.getByRole('heading', { name: 'Sign in to Cavitrace' }).waitFor()
    expect(new URL(page.url()).searchParams.get('next')).toBe('/history')
    expect(await page.locator('nav .nav-link').count()).toBe(0)
    await browser.screenshot('roles-signed-out')
    await page.goto(`${server.url}/safety`)
    await page.getByRole('heading', { name: 'Laser and high-voltage safety' }).waitFor()
  })

  for (const person of demoPeople) {
    it(`when ${person.role} signs in then the menu shows exactly the areas that role may use`, async () => {
      const { page } = browser
      await page.goto(`${server.url}/sign-in`)
      await page.getByTestId('sign-in-email').fill(person.email)
      await page.locator('#sign-in-password').fill(demoPassword)
      await page.getByTestId('sign-in-submit').click()
      await page.getByRole('heading', { name: 'Lab overview' }).waitFor()
      await page.getByTestId('user-menu').waitFor()
      expect(await page.getByTestId('user-menu').innerText()).toContain(person.name)

      const shown = await page.locator('nav .nav-link').evaluateAll((links) => links.map((link) => link.getAttribute('data-area')))
      const expected = appAreas.filter((area) => can(person.role, area.action)).map((area) => area.name)
      expect(shown).toEqual(expected)
      // The walk's fixed points from issue 3: only admins see Admin; viewers cannot reach Tuning (upload).
      expect(shown.includes('admin')).toBe(person.role === 'admin')
      expect(shown.includes('tuning')).toBe(person.role !== 'viewer')
      await browser.screenshot(`roles-${person.role}`)

      if (person.role !== 'admin') {
        // Typing the address does not help either: the route guard reads the same table.
        await page.goto(`${server.url}/admin`)
        await page.getByRole('heading', { name: 'Not allowed' }).waitFor()
      }

      await page.getByTestId('user-menu').click()
      await page.getByRole('menuitem', { name: 'Sign out' }).click()
      await page.getByRole('heading', { name: 'Sign in to Cavitrace' }).waitFor()
    })
  }

  it('when the password is wrong then the sign-in page says so in words', async () => {
    const { page } = browser
    await page.goto(`${server.url}/sign-in`)
    await page.getByTestId('sign-in-email').fill(demoPeople[0].email)
    await page.locator('#sign-in-password').fill('not the demo password')
    await page.getByTestId('sign-in-submit').click()
    expect(await page.getByTestId('sign-in-error').innerText()).toContain('do not match an account')
  })
})

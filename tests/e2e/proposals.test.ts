/**
 * Roles of issue 13 in a real browser: an experimenter proposes a cavity, a lead approves it; a technician who keeps
 * the lens kit saves a lens plan. Invented cavities and people; the demo lab's kit.
 */
import { describe, expect, it } from 'vitest'
import { demoPassword, demoPeople } from '../../shared/auth/demoAccounts'
import { browserSuite } from '../support/browserSuite'
import { signInThroughPage } from '../support/signInPage'

const person = (role: string) => demoPeople.find((p) => p.role === role)!.email

describe('proposing a cavity, and plans saved by a technician, in a real browser', () => {
  const suite = browserSuite({ seedDemo: true })

  it('when an experimenter proposes a cavity then it waits for approval, and a lead approves it into the list', async () => {
    const [server, browser] = [suite.server(), suite.browser()]
    const { page } = browser
    await signInThroughPage(browser, server.url, person('experimenter'), demoPassword)
    await page.goto(`${server.url}/cavities`)
    expect(await page.getByTestId('new-cavity').count()).toBe(0)
    await page.getByTestId('propose-cavity').click()
    const dialog = page.getByTestId('cavity-dialog')
    await dialog.getByTestId('field-name').fill('Setup D cavity')
    for (const [id, value] of [['#field-wavelength', '1064'], ['#field-length', '120'], ['#field-roc2', '1000']]) {
      await page.locator(id).fill(value)
      await page.locator(id).press('Tab')
    }
    // Digits as typed: no thousands separator in a scientific input.
    expect(await page.locator('#field-wavelength').inputValue()).toBe('1064')
    await dialog.getByText('flat').first().click()
    await dialog.getByTestId('cavity-save').click()
    expect(await page.getByTestId('proposal-notice').innerText()).toContain('A lead or an admin approves it')
    const waiting = page.getByTestId('cavity-proposals')
    await waiting.getByText('Setup D cavity').waitFor()
    expect(await waiting.getByTestId('approve-cavity').count()).toBe(0)
    expect(await page.getByTestId('cavity-table').getByText('Setup D cavity').count()).toBe(0)
    await dialog.waitFor({ state: 'detached' })
    await browser.screenshot('proposal-waiting')

    await signInThroughPage(browser, server.url, person('lead'), demoPassword)
    await page.goto(`${server.url}/cavities`)
    await page.getByTestId('cavity-proposals').getByTestId('approve-cavity').click()
    await page.getByTestId('proposal-notice').getByText('Approved').waitFor()
    await page.getByTestId('cavity-table').getByText('Setup D cavity').waitFor()
    expect(await page.getByTestId('cavity-proposals').count()).toBe(0)
  })

  it('when the technician plans lenses for a cavity then the plan can be saved', async () => {
    const [server, browser] = [suite.server(), suite.browser()]
    const { page } = browser
    await signInThroughPage(browser, server.url, person('technician'), demoPassword)
    await page.goto(`${server.url}/planner`)
    await page.getByTestId('planner-picker').getByText('REF-1064 reference cavity').click()
    await page.locator('#beam-waist-x').fill('350')
    await page.locator('#beam-waist-x').press('Tab')
    await page.getByTestId('find-lenses').click()
    await page.getByTestId('plan-verdict').waitFor({ timeout: 30_000 })
    await page.getByTestId('plan-note').fill('saved by the kit keeper')
    await page.getByTestId('save-plan').click()
    await page.getByTestId('plan-saved').waitFor()
    await page.getByTestId('cavity-plans').getByText('saved by the kit keeper').waitFor()
    await browser.screenshot('planner-technician-saved')
  })
})

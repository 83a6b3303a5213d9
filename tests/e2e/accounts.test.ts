/** Accounts in a real browser: invite → accept from the e-mailed link, reset a password, API tokens, admin pages. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { demoPassword, demoPeople } from '../../shared/auth/demoAccounts'
import { launchBrowser, type TestBrowser } from '../support/browser'
import { lastMailId, linkIn, waitForMail } from '../support/mailbox'
import { startTestServer, type TestServer } from '../support/testServer'

describe('accounts in a real browser', () => {
  let server: TestServer
  let browser: TestBrowser
  const admin = demoPeople.find((person) => person.role === 'admin')!
  const newcomer = 'rowan.fieldwork@lab.cavitrace.test'

  async function signIn(email: string, password: string) {
    const { page } = browser
    await page.goto(`${server.url}/sign-in`)
    await page.getByTestId('sign-in-email').fill(email)
    await page.locator('#sign-in-password').fill(password)
    await page.getByTestId('sign-in-submit').click()
    await page.getByTestId('user-menu').waitFor()
  }

  async function signOut() {
    const { page } = browser
    await page.getByTestId('user-menu').click()
    await page.getByRole('menuitem', { name: 'Sign out' }).click()
    await page.getByRole('heading', { name: 'Sign in to Cavitrace' }).waitFor()
  }

  /** Let enter transitions and table overlays finish, so screenshots show the settled page. */
  async function settled(name: string) {
    await browser.page.evaluate(() => Promise.all(document.getAnimations().map((animation) => animation.finished.catch(() => undefined))))
    await browser.screenshot(name)
  }

  async function choosePassword(password: string) {
    await browser.page.locator('#new-password').fill(password)
    await browser.page.locator('#repeat-password').fill(password)
  }

  beforeAll(async () => {
    server = await startTestServer({}, { seedDemo: true })
    browser = await launchBrowser()
  })
  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })

  it('when an admin invites someone then the invitee follows the e-mailed link, chooses a password and lands signed in with that role', async () => {
    const { page } = browser
    await signIn(admin.email, demoPassword)
    await page.locator('nav .nav-link[data-area="admin"]').click()
    await page.getByTestId('people-table').getByText(demoPeople[4].email).waitFor()
    const before = await lastMailId(server.db)
    await page.getByTestId('invite-open').click()
    await page.getByTestId('invite-email').fill(newcomer)
    await page.getByTestId('invite-role').click()
    await page.getByRole('option', { name: /^Technician/ }).click()
    await page.getByTestId('invite-submit').click()
    await page.getByText(`Invitation sent to ${newcomer}.`).waitFor()
    await page.getByTestId('invitation-table').getByText(newcomer).waitFor()
    await settled('accounts-admin-people')

    const mail = await waitForMail(server.db, newcomer, { subject: /invited/, afterId: before })
    const { url } = linkIn(mail, '/accept-invitation')
    await signOut()
    await page.goto(url)
    await page.getByRole('heading', { name: 'Join Cavitrace' }).waitFor()
    // The page keeps the token but drops it from the address bar (and so from the history).
    await page.waitForURL((address) => address.hash === '')
    await page.getByTestId('invitation-name').fill('Rowan Fieldwork')
    await choosePassword('short')
    expect(await page.getByTestId('password-hint').innerText()).toMatch(/at least 12 characters/)
    await choosePassword('bench two is mine now')
    await settled('accounts-accept-invitation')
    await page.getByTestId('invitation-submit').click()
    await page.getByRole('heading', { name: 'Lab overview' }).waitFor()
    expect(await page.getByTestId('user-role').innerText()).toBe('Technician')

    // The same link a second time: refused, in words.
    await signOut()
    await page.goto(url)
    await page.getByTestId('invitation-name').fill('Someone Else')
    await choosePassword('another long passphrase')
    await page.getByTestId('invitation-submit').click()
    expect(await page.getByTestId('invitation-error').innerText()).toContain('already been used')
    await settled('accounts-invitation-reused')
  })

  it('when a password is forgotten then the e-mailed link sets a new one, and the old one stops working', async () => {
    const { page } = browser
    const person = demoPeople.find((candidate) => candidate.role === 'experimenter')!
    const before = await lastMailId(server.db)
    await page.goto(`${server.url}/sign-in`)
    await page.getByText('Forgot your password?').click()
    await page.getByTestId('reset-email').fill(person.email)
    await page.getByRole('button', { name: 'Send the link' }).click()
    expect(await page.getByTestId('reset-request-sent').innerText()).toContain('If an account exists for that address')

    const { url } = linkIn(await waitForMail(server.db, person.email, { subject: /Reset/, afterId: before }), '/reset-password')
    await page.goto(url)
    await choosePassword('a new experimenter passphrase')
    await page.getByTestId('reset-submit').click()
    await page.getByText('Your password has been changed').waitFor()
    await settled('accounts-after-reset')

    await page.getByTestId('sign-in-email').fill(person.email)
    await page.locator('#sign-in-password').fill(demoPassword)
    await page.getByTestId('sign-in-submit').click()
    await page.getByTestId('sign-in-error').waitFor()
    await signIn(person.email, 'a new experimenter passphrase')
    expect(await page.getByTestId('user-role').innerText()).toBe('Experimenter')
    await signOut()
  })

  it('when someone makes an API token then it is shown once, works as a Bearer token, and can be revoked', async () => {
    const { page } = browser
    const person = demoPeople.find((candidate) => candidate.role === 'lead')!
    await signIn(person.email, demoPassword)
    await page.getByTestId('user-menu').click()
    await page.getByRole('menuitem', { name: 'My API tokens' }).click()
    await page.getByRole('heading', { name: 'My API tokens' }).waitFor()
    await page.getByTestId('token-name').fill('bench 2 scope logger')
    await page.getByTestId('token-create').click()
    const secret = (await page.getByTestId('token-secret').locator('code').innerText()).trim()
    expect(secret).toMatch(/^ctk_/)
    await settled('accounts-my-tokens')

    const asScript = await fetch(`${server.url}/api/auth/me`, { headers: { Authorization: `Bearer ${secret}` } })
    expect(((await asScript.json()) as { user: { email: string } }).user.email).toBe(person.email)
    await page.getByTestId('token-table').getByRole('button', { name: 'Revoke' }).click()
    await page.getByTestId('token-table').getByText(/^Revoked/).waitFor()
    expect((await fetch(`${server.url}/api/auth/me`, { headers: { Authorization: `Bearer ${secret}` } })).status).toBe(401)
    await signOut()
  })

  it('when an admin opens the audit log and the outbox then the events and the caught mail show', async () => {
    const { page } = browser
    await signIn(admin.email, demoPassword)
    await page.goto(`${server.url}/admin/audit`)
    await page.getByTestId('audit-table').getByText('invitation.created').first().waitFor()
    await page.getByTestId('audit-table').getByText('token.revoked').first().waitFor()
    await settled('accounts-audit')
    await page.goto(`${server.url}/admin/outbox`)
    await page.getByTestId('outbox-message').first().waitFor()
    expect(await page.getByTestId('outbox-message').count()).toBeGreaterThanOrEqual(2)
    await settled('accounts-outbox')
  })
})

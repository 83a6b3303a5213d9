/** Sign in through the real sign-in page (a fresh cookie jar first), as a person made with a known password. */
import type { TestBrowser } from './browser'

export async function signInThroughPage(browser: TestBrowser, baseUrl: string, email: string, password: string): Promise<void> {
  const { page } = browser
  await page.context().clearCookies()
  await page.goto(`${baseUrl}/sign-in`)
  await page.getByTestId('sign-in-email').fill(email)
  await page.locator('#sign-in-password').fill(password)
  await page.getByTestId('sign-in-submit').click()
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'))
}

/**
 * The set-up most browser suites share: a test server (optionally with the demo lab) and a Chromium, started before
 * the suite and closed after it. Call at the top of a `describe`; read the two through the returned getters.
 */
import { afterAll, beforeAll } from 'vitest'
import { launchBrowser, type TestBrowser } from './browser'
import { startTestServer, type TestServer } from './testServer'

export function browserSuite(options: { seedDemo?: boolean } = {}): { server: () => TestServer; browser: () => TestBrowser } {
  let server: TestServer | undefined
  let browser: TestBrowser | undefined
  beforeAll(async () => {
    server = await startTestServer({}, { seedDemo: options.seedDemo })
    browser = await launchBrowser()
  })
  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })
  return { server: () => server!, browser: () => browser! }
}

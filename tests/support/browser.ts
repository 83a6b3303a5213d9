/** Debian's Chromium driven by playwright-core, in a fresh profile; screenshots go under test-output/. */
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { chromium, type BrowserContext, type Page } from 'playwright-core'

export interface TestBrowser {
  context: BrowserContext
  page: Page
  /** Save a full-page screenshot as test-output/e2e/NAME.png and return its path. */
  screenshot(name: string): Promise<string>
  close(): Promise<void>
}

export async function launchBrowser(): Promise<TestBrowser> {
  const profile = mkdtempSync(join(tmpdir(), 'cavitrace-chromium-'))
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: process.env.CHROMIUM_PATH || '/usr/bin/chromium',
    headless: true,
    viewport: { width: 1280, height: 800 },
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  })
  const page = context.pages()[0] ?? (await context.newPage())
  const outputDir = join(process.env.CAVITRACE_TEST_OUTPUT ?? 'test-output', 'e2e')
  mkdirSync(outputDir, { recursive: true })
  return {
    context,
    page,
    async screenshot(name) {
      const path = join(outputDir, `${name}.png`)
      await page.screenshot({ path, fullPage: true })
      return path
    },
    async close() {
      await context.close()
      rmSync(profile, { recursive: true, force: true })
    },
  }
}

/**
 * Issue 13 in a real browser: a trace the engine flags (generated for a cavity 30 % longer than the one it is
 * dropped on) is shown greyed with its reason and no "met"; the fit check names both Gouy phases and offers the
 * move; the move analyses it again; an analysis is excluded and included again; a trace is deleted and an admin
 * restores it; a failed upload shows its reason on the tuning page. Invented cavities and people.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createActor, type TestActor } from '../support/actors'
import { launchBrowser, type TestBrowser } from '../support/browser'
import { generatedTraceCsv, testCavityGeometry, writeTempFile } from '../support/traceFiles'
import { startTestServer, type TestServer } from '../support/testServer'
import { createPerson, testPassword } from '../api/auth/accountsTestKit'
import { signInThroughPage } from '../support/signInPage'

describe('undoing a wrong upload in a real browser', () => {
  let server: TestServer
  let browser: TestBrowser
  let lead: TestActor
  let cavityId: string
  let longerId: string
  let experimenterEmail: string
  let adminEmail: string
  let wrongAnalysisId: string
  let movedAnalysisId: string

  const signIn = (email: string) => signInThroughPage(browser, server.url, email, testPassword)

  async function dropOnTuningPage(fileName: string, content: string) {
    const { page } = browser
    await page.getByTestId('trace-file-input').setInputFiles(writeTempFile(fileName, content))
    await page.getByTestId('session-traces').getByText(fileName).waitFor({ timeout: 30_000 })
  }

  beforeAll(async () => {
    server = await startTestServer()
    lead = await createActor(server.db, 'lead')
    const make = async (name: string, geometry: object, target: number | null) => {
      const created = await request(server.url).post('/api/cavities').set('Authorization', lead.authorization).send({ name, ...geometry, targetFundamentalFraction: target })
      expect(created.status).toBe(201)
      return created.body.cavity.id as string
    }
    cavityId = await make('Bench 5 reference cavity', testCavityGeometry, 0.7)
    longerId = await make('Bench 6 filter cavity', { ...testCavityGeometry, lengthMm: 130 }, null)
    experimenterEmail = (await createPerson(server, 'experimenter', { name: 'Ola Tunewell' })).email
    adminEmail = (await createPerson(server, 'admin', { name: 'Ada Keeper' })).email
    browser = await launchBrowser()
  })
  afterAll(async () => {
    await browser?.close()
    await server?.close()
  })

  it('when a good trace is dropped then the tuning page shows its number with the stated error and the trace with its order labels', async () => {
    const { page } = browser
    await signIn(experimenterEmail)
    await page.goto(`${server.url}/tuning/${cavityId}`)
    await page.getByTestId('live-status').getByText('Live').waitFor()
    await dropOnTuningPage('scan-good.csv', generatedTraceCsv({ seed: 41 }))
    await page.getByTestId('latest-result').getByText('scan-good.csv').waitFor({ timeout: 30_000 })
    expect(await page.getByTestId('latest-error').innerText()).toMatch(/^± \d+\.\d points/)
    expect(await page.getByTestId('latest-result').getAttribute('data-doubtful')).toBeNull()
    expect(await page.getByTestId('latest-target').innerText()).toMatch(/met$/)
    const chart = page.getByTestId('live-trace').getByTestId('trace-chart')
    await page.waitForFunction(() => (document.querySelector('[data-testid="live-trace"] [data-testid="trace-chart"]')?.getAttribute('data-markers') ?? '').includes('0'))
    expect(((await chart.getAttribute('data-markers')) ?? '').split(' ')).toContain('1')
    await browser.screenshot('undo-tuning-live')
  })

  it('when a trace of the longer cavity is dropped then it is greyed with its reason in one line, no "met", and the list flags it', async () => {
    const { page } = browser
    await dropOnTuningPage('scan-wrong-cavity.csv', generatedTraceCsv({ cavity: { ...testCavityGeometry, lengthMm: 130 }, seed: 42 }))
    await page.getByTestId('latest-result').getByText('scan-wrong-cavity.csv').waitFor({ timeout: 30_000 })
    const latest = page.getByTestId('latest-result')
    expect(await latest.getAttribute('data-doubtful')).toBe('true')
    const doubt = await page.getByTestId('latest-doubt').innerText()
    expect(doubt).toMatch(/^In doubt: the transverse orders do not stand where the cavity geometry puts them/)
    expect(doubt.split('\n')).toHaveLength(1)
    expect(await page.getByTestId('latest-target').innerText()).toContain('cannot tell')
    expect(await latest.innerText()).not.toMatch(/—\s*met/)
    // The greyed number: its colour is the muted grey, not the deep ink of a trusted result.
    const colour = await page.getByTestId('latest-fraction').evaluate((el) => getComputedStyle(el).color)
    expect(colour).toBe('rgb(154, 161, 168)')
    const flagged = page.getByTestId('session-traces').locator('[data-doubtful="true"]')
    expect(await flagged.count()).toBe(1)
    expect(await flagged.innerText()).toContain('in doubt')
    await browser.screenshot('undo-tuning-doubtful')
    wrongAnalysisId = (await page.getByTestId('latest-analysis-link').getAttribute('href'))!.split('/').pop()!
  })

  it('when the full analysis is opened then the headline is greyed, the unassigned power has its own bar, and the fit check names both Gouy phases and offers the move', async () => {
    const { page } = browser
    await page.goto(`${server.url}/analyses/${wrongAnalysisId}`)
    await page.getByTestId('analysis-figures').waitFor()
    expect(await page.getByTestId('analysis-headline').getAttribute('data-doubtful')).toBe('true')
    expect(await page.getByTestId('reading-doubt').innerText()).toMatch(/^In doubt: .*cavity geometry/)
    await page.getByTestId('unassigned-share').waitFor()
    const fit = page.getByTestId('fit-check')
    await fit.waitFor()
    expect(await fit.innerText()).toMatch(/This trace does not look like Bench 5 reference cavity \(measured Gouy phase 0\.53\d rad, expected 0\.464 rad\)\./)
    await browser.screenshot('undo-analysis-doubtful')
    await page.getByTestId('fit-check-move').first().click()
    await page.getByTestId('correction-reason').fill('dropped on the wrong cavity')
    await page.getByTestId('confirm-correction').click()
    await page.waitForURL((url) => url.pathname.startsWith('/analyses/') && !url.pathname.endsWith(wrongAnalysisId))
    movedAnalysisId = new URL(page.url()).pathname.split('/').pop()!
    await page.getByTestId('analysis-figures').waitFor({ timeout: 30_000 })
    expect(await page.getByTestId('analysis-headline').getAttribute('data-doubtful')).toBeNull()
    expect(await page.getByTestId('fit-check').count()).toBe(0)
    const moved = await request(server.url).get(`/api/analyses/${movedAnalysisId}`).set('Authorization', lead.authorization)
    expect(moved.body.cavityId).toBe(longerId)
    await browser.screenshot('undo-analysis-moved')
  })

  it('when the experimenter excludes an analysis with a reason then the page and the cavity history say so, and it can be included again', async () => {
    const { page } = browser
    await page.getByTestId('open-exclude').click()
    await page.getByTestId('correction-reason').fill('laser was mode-hopping')
    await page.getByTestId('confirm-correction').click()
    expect(await page.getByTestId('analysis-excluded').innerText()).toContain('laser was mode-hopping')
    await page.goto(`${server.url}/cavities/${longerId}`)
    const history = page.getByTestId('cavity-history')
    await history.getByText('scan-wrong-cavity.csv').first().waitFor()
    // Both readings of the moved trace are excluded: the one read as the other cavity, and this one.
    expect(await history.getByText('excluded').count()).toBe(2)
    await browser.screenshot('undo-history-excluded')
    await page.goto(`${server.url}/analyses/${movedAnalysisId}`)
    await page.getByTestId('include-again').click()
    await page.getByTestId('analysis-excluded').waitFor({ state: 'detached' })
  })

  it('when the experimenter deletes the trace then it leaves the cavity, and an admin restores it from the deleted list', async () => {
    const { page } = browser
    await page.getByTestId('open-delete').click()
    await page.getByTestId('correction-reason').fill('test upload')
    await page.getByTestId('confirm-correction').click()
    expect(await page.getByTestId('trace-deleted').innerText()).toMatch(/An admin can restore it until \d{4}-\d{2}-\d{2}/)
    await page.goto(`${server.url}/cavities/${longerId}`)
    await page.getByTestId('cavity-history').getByText('No traces analysed yet.').waitFor()

    await signIn(adminEmail)
    await page.goto(`${server.url}/admin/deleted`)
    const table = page.getByTestId('deleted-traces')
    await table.getByText('scan-wrong-cavity.csv').waitFor()
    expect(await table.innerText()).toContain('test upload')
    await browser.screenshot('undo-admin-deleted')
    await page.getByTestId('restore-trace').click()
    await page.getByTestId('restore-notice').getByText('is back').waitFor()
    await page.goto(`${server.url}/cavities/${longerId}`)
    await page.getByTestId('cavity-history').getByText('scan-wrong-cavity.csv').first().waitFor()
  })

  it('when an upload cannot be analysed then the tuning page says why inline, and the earlier result is marked as the previous one', async () => {
    const { page } = browser
    await signIn(experimenterEmail)
    await page.goto(`${server.url}/tuning/${cavityId}`)
    await page.getByTestId('latest-result').waitFor()
    await dropOnTuningPage('scan-one-row.csv', 'time,volts\n0,1\n')
    const reason = page.getByTestId('failed-reason')
    await reason.waitFor({ timeout: 30_000 })
    expect((await reason.innerText()).length).toBeGreaterThan(10)
    expect(await page.getByTestId('newest-failed').innerText()).toContain('the result below is the previous one')
    await browser.screenshot('undo-tuning-failed')
  })
})

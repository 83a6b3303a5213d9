/**
 * Issue 17, item 2: the planner's work is bounded. A search too large is refused with the step that fits, a time
 * budget cuts a search short and the answer says so, a client that hangs up ends its search, and one person runs
 * one search at a time. The kit and the beam are an invented lab's.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createActor, type TestActor } from '../support/actors'
import { serverModule, startTestServer, type TestServer } from '../support/testServer'

const geometry = { wavelengthNm: 1064, lengthMm: 100, roc1Mm: 250, roc2Mm: 250 }
const beam = { kind: 'waist', x: { waistRadiusMm: 0.3, waistPositionMm: 0 } }
const table = { laserToCavityMm: 600, lensZonesMm: [[50, 250], [300, 500]], minSpacingMm: 10, positionStepMm: 1 }
const stock = [25, 30, 40, 50, 60, 75, 80, 125, 150, 175, 250, 300, 400, 500, 750, 1000, -50, -75, -100, -150]

/** A server with the given planner limits, a cavity and a 40-lens kit. */
async function plannerServer(env: Record<string, string>) {
  const server = await startTestServer(env)
  const lead = await createActor(server.db, 'lead')
  const created = await request(server.url).post('/api/cavities').set('Authorization', lead.authorization).send({ name: 'Budget cavity', ...geometry })
  const focal = [...stock, ...stock.map((f) => Math.round(f * 1.07))]
  const csv = ['label,focal_length_mm,count,type,wavelength_min_nm,wavelength_max_nm,notes', ...focal.map((f, i) => `K${i},${f},1,${f < 0 ? 'plano-concave' : 'plano-convex'},,,`)]
  const kit = await request(server.url).post('/api/lenses/import').set('Authorization', lead.authorization).set('Content-Type', 'text/csv').send(csv.join('\n'))
  expect(kit.body.created).toBe(40)
  return { server, lead, cavityId: created.body.cavity.id as string }
}

const plan = (server: TestServer, actor: TestActor, cavityId: string, body: object) =>
  request(server.url).post(`/api/cavities/${cavityId}/plan`).set('Authorization', actor.authorization).send(body)

describe('the planner with a small work limit', () => {
  let setup: Awaited<ReturnType<typeof plannerServer>>
  beforeAll(async () => {
    // 40 lenses × 402 positions on a 1 mm grid weigh about 1.3 × 10⁸ two-lens placements.
    setup = await plannerServer({ PLANNER_MAX_PLACEMENTS: '20000000' })
  })
  afterAll(() => setup.server.close())

  it('when the search is too large then 422 says how far to coarsen the step, and that step is accepted', async () => {
    const refused = await plan(setup.server, setup.lead, setup.cavityId, { beam, table })
    expect(refused.status).toBe(422)
    expect(refused.body.error.code).toBe('search_too_large')
    expect(refused.body.error.message).toMatch(/40 lenses × 402 positions/)
    const step = Number(/Coarsen positionStepMm to ([\d.]+) mm or more/.exec(refused.body.error.message)?.[1])
    expect(step).toBeGreaterThan(1)
    const accepted = await plan(setup.server, setup.lead, setup.cavityId, { beam, table: { ...table, positionStepMm: step } })
    expect(accepted.status, JSON.stringify(accepted.body)).toBe(200)
    expect(accepted.body.cut).toBeNull()
    expect((40 * accepted.body.evaluated.positions) ** 2 / 2).toBeLessThanOrEqual(20_000_000)
  })
})

describe('the planner with a tiny time budget', () => {
  let setup: Awaited<ReturnType<typeof plannerServer>>
  beforeAll(async () => {
    setup = await plannerServer({ PLANNER_TIME_BUDGET_SECONDS: '0.001' })
  })
  afterAll(() => setup.server.close())

  it('when the budget runs out then the answer comes with what was found and says where it was cut', async () => {
    const response = await plan(setup.server, setup.lead, setup.cavityId, { beam, table })
    expect(response.status, JSON.stringify(response.body)).toBe(200)
    expect(response.body.cut).toMatch(/cut short by its time budget: two-lens pairs were searched for \d+ of 40 first lenses/)
    expect(response.body.arrangements.length).toBeGreaterThan(0)
    // A full search weighs about 1.2 × 10⁸ placements ((40 × 402)² / 2, less the spacing); a cut one far fewer.
    expect(response.body.evaluated.twoLens).toBeLessThan(100_000_000)
  })
})

describe('the planner with the default budget', () => {
  let setup: Awaited<ReturnType<typeof plannerServer>>
  beforeAll(async () => {
    setup = await plannerServer({})
  })
  afterAll(() => setup.server.close())

  it('when the client hangs up then its search thread is ended', async () => {
    // Counted in the module the server runs (the built one under npm test), not in a second copy of the sources.
    const { planThreadsEnded } = await serverModule()
    const before = planThreadsEnded()
    // A 0.4 mm grid weighs about 8 × 10⁸ placements: seconds of work, within the default limit.
    const hungUp = plan(setup.server, setup.lead, setup.cavityId, { beam, table: { ...table, positionStepMm: 0.4 } }).timeout(300)
    await expect(hungUp).rejects.toThrow(/Timeout/)
    for (let k = 0; k < 50 && planThreadsEnded() === before; k++) await new Promise((resolve) => setTimeout(resolve, 100))
    expect(planThreadsEnded()).toBe(before + 1)
  })

  it('when one person starts a second search then the first is cancelled (409) and the second answers', async () => {
    const body = { beam, table: { ...table, positionStepMm: 0.4 } }
    const first = plan(setup.server, setup.lead, setup.cavityId, body).then((r) => r)
    await new Promise((resolve) => setTimeout(resolve, 300))
    const second = await plan(setup.server, setup.lead, setup.cavityId, { beam, table })
    expect(second.status).toBe(200)
    const firstAnswer = await first
    expect(firstAnswer.status).toBe(409)
    expect(firstAnswer.body.error.code).toBe('search_replaced')
  })
})

/**
 * The mode-matching planner over HTTP (issue 8, items 4–7): a constructed problem whose exact answer is in the kit,
 * the pictures' data, measured radii fitted with warnings, invalid inputs with clear messages, saved plans, and an
 * analysis's order-2 share read as waist errors. The cavity, beam and lenses are an invented lab's. Physics: ABCD law
 * and the Gaussian overlap (Kogelnik & Li, Appl. Opt. 5, 1550 (1966)); the expected answers are constructed.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { AnalysisResult } from '../../shared/analysis/types'
import { applyAbcd, cavityEigenmodeBeam, composeMatrices, freeSpaceMatrix, invertMatrix, thinLensMatrix } from '../../shared/beam'
import { finishAnalysis, insertAnalysis } from '../../server/analyses/analysisRepository'
import { insertTrace } from '../../server/traces/traceRepository'
import { createActor, type TestActor } from '../support/actors'
import { startTestServer, type TestServer } from '../support/testServer'

const geometry = { wavelengthNm: 1064, lengthMm: 100, roc1Mm: 250, roc2Mm: 250 }
const table = { laserToCavityMm: 600, lensZonesMm: [[50, 250], [300, 500]], minSpacingMm: 10, positionStepMm: 1 }
const stock = [25, 30, 40, 50, 60, 75, 80, 125, 150, 175, 250, 300, 400, 500, 750, 1000, -50, -75, -100, -150]

/** The beam waist (per axis) that f = 100 mm at 150 mm and f = 200 mm at 420 mm put exactly into the cavity mode. */
function constructedWaist() {
  const target = cavityEigenmodeBeam(geometry)
  const system = composeMatrices(freeSpaceMatrix(150), thinLensMatrix(100), freeSpaceMatrix(270), thinLensMatrix(200), freeSpaceMatrix(180))
  const q0 = applyAbcd({ re: -target.waistFromEntranceMm, im: target.rayleighRangeMm }, invertMatrix(system))
  return { waistRadiusMm: Math.sqrt((1064e-6 * q0.im) / Math.PI), waistPositionMm: -q0.re, rayleighRangeMm: q0.im }
}

describe('the mode-matching planner', () => {
  let server: TestServer
  let lead: TestActor
  let experimenter: TestActor
  let otherExperimenter: TestActor
  let viewer: TestActor
  let cavityId: string
  const waist = constructedWaist()
  const beam = { kind: 'waist', x: { waistRadiusMm: waist.waistRadiusMm, waistPositionMm: waist.waistPositionMm } }

  const as = (actor: TestActor) => ({
    get: (path: string) => request(server.url).get(path).set('Authorization', actor.authorization),
    post: (path: string) => request(server.url).post(path).set('Authorization', actor.authorization),
    delete: (path: string) => request(server.url).delete(path).set('Authorization', actor.authorization),
  })

  beforeAll(async () => {
    server = await startTestServer()
    lead = await createActor(server.db, 'lead')
    experimenter = await createActor(server.db, 'experimenter')
    otherExperimenter = await createActor(server.db, 'experimenter')
    viewer = await createActor(server.db, 'viewer')
    const created = await as(lead).post('/api/cavities').send({ name: 'Planner test cavity', ...geometry })
    expect(created.status).toBe(201)
    cavityId = created.body.cavity.id
    // A 40-lens kit: 38 stock lenses (+7 % copies, none 100 or 200 mm), the two of the exact answer, and two lenses
    // the planner must leave out (a cylindrical one, one coated for visible light only).
    const focal = [...stock, ...stock.map((f) => Math.round(f * 1.07))].slice(0, 38)
    const lines = ['label,focal_length_mm,count,type,wavelength_min_nm,wavelength_max_nm,notes', ...focal.map((f, i) => `K${i},${f},1,${f < 0 ? 'plano-concave' : 'plano-convex'},,,`)]
    lines.push('A100,100,1,plano-convex,650,1100,', 'B200,200,1,bi-convex,,,', 'CYL-100,100,1,cylindrical,,,', 'VIS-200,200,2,achromat,400,700,')
    const kit = await as(lead).post('/api/lenses/import').set('Content-Type', 'text/csv').send(lines.join('\n'))
    expect(kit.status, JSON.stringify(kit.body)).toBe(200)
    expect(kit.body.created).toBe(42)
  })
  afterAll(() => server?.close())

  it('when the exact answer is in the kit then it comes first at coupling > 0.999999, with the pictures', async () => {
    const response = await as(viewer).post(`/api/cavities/${cavityId}/plan`).send({ beam, table, rankBy: 'coupling' })
    expect(response.status, JSON.stringify(response.body)).toBe(200)
    const plan = response.body
    const best = plan.arrangements[0]
    expect(best.coupling).toBeGreaterThan(0.999999)
    expect(best.lenses.map((l: { label: string; zMm: number }) => [l.label, l.zMm])).toEqual([['A100', 150], ['B200', 420]])
    expect(best.tolerance.perLens).toHaveLength(2)
    expect(best.tolerance.worstCoupling).toBeLessThan(best.coupling)
    expect(plan.reachesTarget).toBe(true)
    expect(plan.verdict).toMatch(/reach the 95.0 % target/)
    expect(plan.kit.used).toBe(40)
    expect(plan.kit.left.map((l: { label: string }) => l.label).sort()).toEqual(['CYL-100', 'VIS-200'])
    expect(plan.kit.left.find((l: { label: string }) => l.label === 'VIS-200').reason).toContain('not 1064 nm')
    // The ideal free-focal-length pair reaches the same 100 % (the constructed answer is one of them).
    expect(plan.ideal.twoLens[0].coupling).toBeGreaterThan(0.9999)

    const { path, map } = plan.pictures
    expect(path.zMm.length).toBeGreaterThanOrEqual(300)
    expect(path.zMm.length).toBeLessThanOrEqual(310)
    expect(path.zMm[0]).toBe(0)
    expect(path.zMm.at(-1)).toBe(700) // laser-to-cavity 600 mm + cavity length 100 mm
    // Matched exactly, the beam inside the cavity is the eigenmode: equal radii at mirror 2 (z = 700 mm).
    expect(path.radiusXMm.at(-1)).toBeCloseTo(path.cavity.radiusMm.at(-1), 5)
    expect(path.cavity.zMm.at(-1)).toBe(700)
    expect(path.cavity.fromMm).toBe(600)
    expect(path.cavity.toMm).toBe(700)
    expect(map.lensA.label).toBe('A100')
    expect(map.aZMm.length).toBeLessThanOrEqual(100)
    expect(map.coupling).toHaveLength(map.aZMm.length * map.bZMm.length)
    // Cells outside both zones (250–300 mm) cannot hold a lens.
    const gap = map.aZMm.findIndex((z: number) => z > 255 && z < 295)
    expect(map.coupling[gap * map.bZMm.length + 10]).toBeNull()
    expect(map.best.coupling).toBeGreaterThan(0.99)
    expect(JSON.stringify(plan).length).toBeLessThan(250_000)
  })

  it('when the beam is given as measured radii then the ISO 11146-1 fit recovers it and warns when the waist is not bracketed', async () => {
    // Radii generated from w(z)² = w0² + (λ/(π w0))² (z − z0)² (ISO 11146-1 hyperbola, M² = 1), no noise, all on one side of the waist.
    const w0 = 0.4
    const z0 = -50
    const zR = (Math.PI * w0 * w0) / 1064e-6
    const zMm = [100, 200, 300, 400, 500, 600]
    const radiusXMm = zMm.map((z) => w0 * Math.sqrt(1 + ((z - z0) / zR) ** 2))
    const response = await as(viewer).post(`/api/cavities/${cavityId}/plan`).send({ beam: { kind: 'measured', zMm, radiusXMm, radiusUncertaintyMm: 0.005 }, table })
    expect(response.status, JSON.stringify(response.body)).toBe(200)
    expect(response.body.fits.x.waistRadiusMm).toBeCloseTo(w0, 6)
    expect(response.body.fits.x.waistPositionMm).toBeCloseTo(z0, 3)
    expect(response.body.fits.x.m2).toBeCloseTo(1, 6)
    expect(response.body.fits.x.uncertainty.waistRadiusMm).toBeGreaterThan(0)
    expect(response.body.warnings.map((w: { code: string }) => w.code)).toContain('waist_not_bracketed')
  })

  it('when the inputs are impossible then each answer names the problem', async () => {
    const plan = (body: object) => as(viewer).post(`/api/cavities/${cavityId}/plan`).send({ beam, table, ...body })
    const cases: [object, number, string, RegExp][] = [
      [{ table: { ...table, laserToCavityMm: -100 } }, 400, 'invalid_input', /laserToCavityMm must be a positive distance/],
      [{ table: { ...table, lensZonesMm: [[-20, 100]] } }, 400, 'invalid_input', /must not be negative/],
      [{ table: { ...table, lensZonesMm: [[50, 900]] } }, 422, 'zone_outside_path', /^Lens zone 1 \(50–900 mm\) reaches outside the path: a zone must lie between the laser \(0 mm\) and the cavity \(600 mm\)\.$/],
      [{ table: { ...table, lensZonesMm: [] } }, 400, 'invalid_input', /at least one/],
      [{ beam: { kind: 'waist', x: { waistRadiusMm: 20, waistPositionMm: 0 } } }, 422, 'beam_too_large', /larger than the table's optics allow/],
      [{ beam: { kind: 'waist', wavelengthNm: 780, x: { waistRadiusMm: 0.4, waistPositionMm: 0 } } }, 422, 'wavelength_mismatch', /780 nm/],
      [{ beam: { kind: 'measured', zMm: [0, 100, 200], radiusXMm: [1, 1, 1] } }, 400, 'invalid_input', /at least 4 positions/],
      [{ beam: { kind: 'beam' } }, 400, 'invalid_input', /beam.kind must be "waist" or "measured"/],
      [{ couplingTarget: 95 }, 400, 'invalid_input', /a fraction, not percent/],
      [{ lensIds: ['00000000-0000-4000-8000-000000000000'] }, 422, 'unknown_lens', /no lens with id/],
    ]
    for (const [body, status, code, message] of cases) {
      const response = await plan(body)
      expect(response.status, JSON.stringify(body)).toBe(status)
      expect(response.body.error.code, JSON.stringify(response.body)).toBe(code)
      expect(response.body.error.message).toMatch(message)
    }
    const nowhere = await as(viewer).post('/api/cavities/00000000-0000-4000-8000-000000000000/plan').send({ beam, table })
    expect(nowhere.status).toBe(404)
  })

  it('when only unusable lenses are chosen, or the kit is empty, then the answer says so plainly', async () => {
    const lenses = (await as(viewer).get('/api/lenses')).body.lenses as Array<{ id: string; label: string }>
    const cylindrical = lenses.find((l) => l.label === 'CYL-100')!
    const response = await as(viewer).post(`/api/cavities/${cavityId}/plan`).send({ beam, table, lensIds: [cylindrical.id] })
    expect(response.status).toBe(422)
    expect(response.body.error.code).toBe('empty_kit')
    expect(response.body.error.message).toContain('CYL-100: cylindrical')

    const empty = await startTestServer()
    try {
      const emptyLead = await createActor(empty.db, 'lead')
      const created = await request(empty.url).post('/api/cavities').set('Authorization', emptyLead.authorization).send({ name: 'Bare', ...geometry })
      const answer = await request(empty.url).post(`/api/cavities/${created.body.cavity.id}/plan`).set('Authorization', emptyLead.authorization).send({ beam, table })
      expect(answer.status).toBe(422)
      expect(answer.body.error.message).toMatch(/lens kit is empty/)
    } finally {
      await empty.close()
    }
  })

  it('when a plan is saved then it is listed for the cavity, read back with recomputed coupling and pictures, and deleted only by its author, a lead or an admin', async () => {
    const lenses = (await as(viewer).get('/api/lenses')).body.lenses as Array<{ id: string; label: string }>
    const id = (label: string) => lenses.find((l) => l.label === label)!.id
    const refused = await as(viewer).post(`/api/cavities/${cavityId}/plans`).send({ inputs: { beam, table }, lenses: [{ lensId: id('A100'), zMm: 150 }] })
    expect(refused.status).toBe(403)

    const saved = await as(experimenter)
      .post(`/api/cavities/${cavityId}/plans`)
      .send({ inputs: { beam, table }, lenses: [{ lensId: id('B200'), zMm: 420 }, { lensId: id('A100'), zMm: 150 }], note: 'mount L1 on the short rail' })
    expect(saved.status, JSON.stringify(saved.body)).toBe(201)
    const plan = saved.body.plan
    expect(plan.solution.lenses.map((l: { label: string }) => l.label)).toEqual(['A100', 'B200'])
    expect(plan.coupling).toBeGreaterThan(0.999999)
    expect(plan.note).toBe('mount L1 on the short rail')
    expect(plan.author.id).toBe(experimenter.id)
    expect(plan.pictures.map.lensB.label).toBe('B200')

    const toBuy = await as(experimenter).post(`/api/cavities/${cavityId}/plans`).send({ inputs: { beam, table }, lenses: [{ focalLengthMm: 300, zMm: 200 }] })
    expect(toBuy.status).toBe(201)
    expect(toBuy.body.plan.solution.lenses[0]).toMatchObject({ lensId: null, focalLengthMm: 300 })
    expect(toBuy.body.plan.pictures.map).toBeNull()

    const outside = await as(experimenter).post(`/api/cavities/${cavityId}/plans`).send({ inputs: { beam, table }, lenses: [{ focalLengthMm: 300, zMm: 650 }] })
    expect(outside.status).toBe(422)
    expect(outside.body.error.message).toContain('outside the path')

    const listed = await as(viewer).get(`/api/cavities/${cavityId}/plans`)
    expect(listed.body.plans.map((p: { id: string }) => p.id)).toEqual([toBuy.body.plan.id, plan.id])

    expect((await as(otherExperimenter).delete(`/api/plans/${plan.id}`)).status).toBe(403)
    expect((await as(experimenter).delete(`/api/plans/${toBuy.body.plan.id}`)).status).toBe(204)
    expect((await as(viewer).get(`/api/plans/${toBuy.body.plan.id}`)).status).toBe(404)
    const read = await as(viewer).get(`/api/plans/${plan.id}`)
    expect(read.status).toBe(200)
    expect(read.body.plan.pictures.path.lenses).toHaveLength(2)
  })

  it('when an analysis shows order-2 power then the family of waist errors is given, with what moving each lens of the saved plan does', async () => {
    const { trace } = await insertTrace(server.db, { cavityId, sha256: 'planner-test', fileName: 'scan.csv', sizeBytes: 1, contentGzip: Buffer.from([]), note: '', uploadedBy: null })
    const analysis = await insertAnalysis(server.db, { traceId: trace.id, cavityId, options: {}, geometry, requestedBy: null })
    // A constructed result: 4 % of the power in order 2.
    const result = { fundamentalFraction: 0.93, finesse: 400, linewidthHz: 3.7e6, orders: { '0': 0.93, '1': 0.03, '2': 0.04 } } as unknown as AnalysisResult
    await finishAnalysis(server.db, analysis.id, { result, engineMs: 1 })

    const response = await as(viewer).get(`/api/analyses/${analysis.id}/mismatch-family`)
    expect(response.status, JSON.stringify(response.body)).toBe(200)
    const { family, mode, plan } = response.body
    expect(response.body.order2Share).toBe(0.04)
    // Pure size error r = w/w0: η = (2r / (1 + r²))² (Kogelnik & Li (1966), from memory) must give 1 − 0.04.
    const r = family.pureSize.largerRatio
    expect((2 * r / (1 + r * r)) ** 2).toBeCloseTo(0.96, 10)
    expect(family.pureSize.smallerRatio).toBeCloseTo(1 / r, 10)
    // Pure position error Δz: η = 1 / (1 + (Δz / 2 z_R)²) (same source, from memory).
    expect(1 / (1 + (family.purePositionMm / (2 * mode.rayleighRangeMm)) ** 2)).toBeCloseTo(0.96, 10)
    expect(response.body.reading).toContain('power alone cannot tell which')
    expect(plan.lenses.map((l: { label: string }) => l.label)).toEqual(['A100', 'B200'])
    expect(plan.steps.map((s: { stepMm: number }) => s.stepMm)).toEqual([0.5, 1, 2, 5])
    // Larger moves lose more (at an exact optimum).
    const worst = plan.steps.map((s: { worstCoupling: number }) => s.worstCoupling)
    for (let i = 1; i < worst.length; i++) expect(worst[i]).toBeLessThan(worst[i - 1])

    const queued = await insertAnalysis(server.db, { traceId: trace.id, cavityId, options: {}, geometry, requestedBy: null })
    const notDone = await as(viewer).get(`/api/analyses/${queued.id}/mismatch-family`)
    expect(notDone.status).toBe(409)
    expect(notDone.body.error.message).toContain('needs a finished analysis')
  })
})

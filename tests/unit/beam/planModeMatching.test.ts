import { describe, expect, it } from 'vitest'
import {
  applyAbcd,
  beamParameterAt,
  cavityEigenmodeBeam,
  coaxialCoupling,
  composeMatrices,
  freeSpaceMatrix,
  invertMatrix,
  pathCoupling,
  planModeMatching,
  thinLensMatrix,
  type Beam,
  type KitLens,
} from '../../../shared/beam'
import { engineErrorOf } from './helpers'

// An invented lab: a 1064 nm cavity (L = 100 mm, R = 250 mm both mirrors) 600 mm from the laser's reference plane,
// lenses allowed in two 200 mm zones. Physics: ABCD law and the Gaussian overlap (Kogelnik & Li, Appl. Opt. 5, 1550
// (1966)); the expected answers are constructed, not quoted.
const cavity = { wavelengthNm: 1064, lengthMm: 100, roc1Mm: 250, roc2Mm: 250 }
const table = { laserToCavityMm: 600, lensZonesMm: [[50, 250], [300, 500]] as [number, number][], minSpacingMm: 10 }
const stock = [25, 30, 40, 50, 60, 75, 80, 125, 150, 175, 250, 300, 400, 500, 750, 1000, -50, -75, -100, -150]

/** A 40-lens kit: the stock focal lengths and the same +7 % (no 100 mm or 200 mm among them), plus `extra`. */
function kitWith(extra: KitLens[]): KitLens[] {
  const distractors = [...stock, ...stock.map((f) => Math.round(f * 1.07))].map((f, i) => ({ id: `K${i}`, focalLengthMm: f, count: 1 }))
  return [...distractors.slice(0, 40 - extra.length), ...extra]
}

/** The beam that f = 100 mm at 150 mm and f = 200 mm at 420 mm put exactly into the cavity mode. */
function constructedBeam(): Beam {
  const target = cavityEigenmodeBeam(cavity)
  const system = composeMatrices(freeSpaceMatrix(150), thinLensMatrix(100), freeSpaceMatrix(270), thinLensMatrix(200), freeSpaceMatrix(180))
  const q0 = applyAbcd({ re: -target.waistFromEntranceMm, im: target.rayleighRangeMm }, invertMatrix(system))
  const axis = { waistRadiusMm: Math.sqrt((1064e-6 * q0.im) / Math.PI), waistPositionMm: -q0.re, m2: 1 }
  return { wavelengthNm: 1064, x: { ...axis }, y: { ...axis } }
}

describe('planModeMatching', () => {
  const beam = constructedBeam()
  const kit = kitWith([
    { id: 'A100', focalLengthMm: 100, count: 1 },
    { id: 'B200', focalLengthMm: 200, count: 1 },
  ])

  it('when the exact answer is in the kit then it is found at 100 % coupling (to 1e-6)', () => {
    expect(kit).toHaveLength(40)
    const plan = planModeMatching({ cavity, beam, kit, table }, { rankBy: 'coupling' })
    const best = plan.arrangements[0]
    expect(best.coupling).toBeGreaterThan(1 - 1e-6)
    expect(best.lenses.map((l) => [l.id, l.zMm])).toEqual([['A100', 150], ['B200', 420]])
    // The fast search and the plain reference propagation agree.
    expect(pathCoupling(plan.path, best.lenses).coupling).toBeCloseTo(best.coupling, 12)
    expect(plan.reachesTarget).toBe(true)
    expect(plan.verdict).toMatch(/reach the 95.0 % target/)
    // 40 × 40 ordered pairs minus the 40 same-lens pairs (every count is 1), over every allowed pair of positions.
    expect(plan.evaluated.positions).toBe(402) // 201 + 201 grid points; the 10 mm end spacing does not clip these zones
    expect(plan.evaluated.twoLens).toBeGreaterThan(1560 * 60000)
  })

  it('when ranked by robustness then every arrangement reports per-lens ±1 mm losses consistent with the coupling', () => {
    const plan = planModeMatching({ cavity, beam, kit, table }, { maxArrangements: 50 })
    for (let i = 1; i < plan.arrangements.length; i++) {
      expect(plan.arrangements[i - 1].tolerance.worstCoupling).toBeGreaterThanOrEqual(plan.arrangements[i].tolerance.worstCoupling)
    }
    expect(plan.arrangements[0].tolerance.worstCoupling).toBeGreaterThan(0.999)
    const byCoupling = planModeMatching({ cavity, beam, kit, table }, { rankBy: 'coupling' })
    const exact = byCoupling.arrangements.find((a) => a.lenses.map((l) => l.id).join() === 'A100,B200')
    expect(exact).toBeDefined()
    const [first, second] = exact!.tolerance.perLens
    // At an exact optimum every move loses coupling.
    for (const loss of [first.lossMinus, first.lossPlus, second.lossMinus, second.lossPlus]) expect(loss).toBeGreaterThan(0)
    const moved = pathCoupling(plan.path, [{ zMm: 151, focalLengthMm: 100 }, { zMm: 420, focalLengthMm: 200 }]).coupling
    expect(first.lossPlus).toBeCloseTo(exact!.coupling - moved, 12)
    expect(exact!.tolerance.worstCoupling).toBeLessThanOrEqual(exact!.coupling - Math.max(first.lossPlus, second.lossMinus) + 1e-15)
  })

  it('when the ideal lenses are asked for then free focal lengths reach 100 % inside the zones', () => {
    const plan = planModeMatching({ cavity, beam, kit, table })
    expect(plan.ideal.twoLens.length).toBeGreaterThan(0)
    for (const solution of plan.ideal.twoLens) {
      expect(solution.coupling).toBeGreaterThan(1 - 1e-9)
      for (const lens of solution.lenses) {
        expect(table.lensZonesMm.some(([a, b]) => lens.zMm >= a && lens.zMm <= b)).toBe(true)
        expect(Math.abs(lens.focalLengthMm)).toBeGreaterThanOrEqual(10)
      }
      expect(pathCoupling(plan.path, solution.lenses).coupling).toBeCloseTo(solution.coupling, 9)
    }
    expect(plan.ideal.singleLens).not.toBeNull()
  })

  it('when nothing in the kit is close then the verdict says so plainly and names the ideal lenses', () => {
    const plan = planModeMatching(
      { cavity, beam: { ...beam }, kit: [{ id: 'long', focalLengthMm: 5000, count: 2 }, { id: 'neg', focalLengthMm: -1000, count: 1 }], table },
      { couplingTarget: 0.99 },
    )
    expect(plan.reachesTarget).toBe(false)
    expect(plan.verdict).toMatch(/^Nothing in the kit reaches the 99.0 % target: the best arrangement, .* couples \d+\.\d %\. Ideal lenses: f = /)
  })

  it('when a lens is in the kit once then it is never used twice, and when twice then it may be', () => {
    const single = planModeMatching({ cavity, beam, kit: [{ id: 'F', focalLengthMm: 150, count: 1 }], table }, { maxArrangements: 50 })
    expect(single.arrangements.every((a) => a.lenses.length === 1)).toBe(true)
    // The one-lens scan and the plain reference propagation agree.
    for (const arrangement of single.arrangements) expect(pathCoupling(single.path, arrangement.lenses).coupling).toBeCloseTo(arrangement.coupling, 12)
    const double = planModeMatching({ cavity, beam, kit: [{ id: 'F', focalLengthMm: 150, count: 2 }], table }, { maxArrangements: 50 })
    expect(double.arrangements.some((a) => a.lenses.length === 2)).toBe(true)
  })

  it('when the beam is astigmatic then the search and the reference agree and a warning explains the limit', () => {
    const astigmatic: Beam = { ...beam, y: { ...beam.y, waistRadiusMm: beam.y.waistRadiusMm * 1.3, waistPositionMm: beam.y.waistPositionMm + 40 } }
    const plan = planModeMatching({ cavity, beam: astigmatic, kit, table }, { rankBy: 'coupling' })
    const best = plan.arrangements[0]
    expect(best.coupling).toBeLessThan(0.999)
    expect(best.kind).toBe('two-lens')
    expect(pathCoupling(plan.path, best.lenses).coupling).toBeCloseTo(best.coupling, 12)
    expect(plan.warnings.map((w) => w.code)).toContain('astigmatic_beam')
  })

  it('when the beam is astigmatic then the ideal lenses reach the limit spherical lenses allow', () => {
    // With tanh(d/2) = |q1 − q2| / |q1 − q2*| (the hyperbolic distance of the q half-plane; 1 − η = tanh²(d/2) is the
    // OPTICS-CHECKS §2(e) q form), the best any spherical system can do is to put the mode half-way between the two
    // axes: η = 1 / cosh²(d/4) (derived here; lens systems are isometries of that plane).
    const astigmatic: Beam = { wavelengthNm: 1064, x: { waistRadiusMm: 0.45, waistPositionMm: -30, m2: 1 }, y: { waistRadiusMm: 0.55, waistPositionMm: 10, m2: 1.1 } }
    const plan = planModeMatching({ cavity, beam: astigmatic, kit, table })
    const qx = beamParameterAt(astigmatic.x, 1064, 0)
    const qy = beamParameterAt(astigmatic.y, 1064, 0)
    const halfDistance = Math.acosh(1 / Math.sqrt(coaxialCoupling(qx.re, qx.im, qy.re, qy.im)))
    const limit = 1 / Math.cosh(halfDistance / 2) ** 2
    // One free lens on a continuous position reaches the limit; two free lenses at the coarse grid positions of the
    // ideal search come within 1e-4 of it.
    expect(plan.ideal.singleLens!.coupling).toBeGreaterThan(limit - 1e-9)
    expect(plan.ideal.singleLens!.coupling).toBeLessThanOrEqual(limit + 1e-12)
    for (const solution of plan.ideal.twoLens) {
      expect(solution.coupling).toBeLessThanOrEqual(limit + 1e-12)
      expect(solution.coupling).toBeGreaterThan(limit - 1e-4)
    }
    expect(Math.max(...plan.arrangements.map((a) => a.coupling))).toBeLessThanOrEqual(limit + 1e-12)
  })

  it('when the beam has M² > 1 then a warning says the couplings are for the embedded Gaussian', () => {
    const rough: Beam = { ...beam, x: { ...beam.x, m2: 1.4 }, y: { ...beam.y, m2: 1.4 } }
    const plan = planModeMatching({ cavity, beam: rough, kit, table })
    expect(plan.warnings.map((w) => w.code)).toContain('beam_quality')
  })

  it('when the input is invalid then each problem gets its own clear error', () => {
    const run = (patch: Partial<Parameters<typeof planModeMatching>[0]>, options = {}) =>
      engineErrorOf(() => planModeMatching({ cavity, beam, kit, table, ...patch }, options))
    expect(run({ kit: [] }).code).toBe('empty_kit')
    expect(run({ kit: [{ id: 'x', focalLengthMm: 100, count: 0 }] }).code).toBe('empty_kit')
    expect(run({ kit: [{ id: 'x', focalLengthMm: 0, count: 1 }] }).code).toBe('invalid_kit')
    expect(run({ table: { ...table, laserToCavityMm: -600 } }).code).toBe('invalid_table')
    expect(run({ table: { ...table, lensZonesMm: [[-10, 100]] } }).code).toBe('zone_outside_path')
    expect(run({ table: { ...table, lensZonesMm: [[0, 700]] } }).code).toBe('zone_outside_path')
    expect(run({ table: { ...table, lensZonesMm: [[0, 5]] } }).code).toBe('no_room_for_lenses')
    expect(run({ table: { ...table, positionStepMm: 0 } }).message).toMatch(/positionStepMm/)
    expect(run({ beam: { ...beam, x: { ...beam.x, waistRadiusMm: 20 } } }).code).toBe('beam_too_large')
    expect(run({ beam: { ...beam, wavelengthNm: 780 } }).code).toBe('wavelength_mismatch')
    expect(run({ cavity: { ...cavity, roc1Mm: 40, roc2Mm: 40 } }).code).toBe('unstable_cavity')
    expect(run({}, { couplingTarget: 95 }).message).toMatch(/couplingTarget/)
  })
})

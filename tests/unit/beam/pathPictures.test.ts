import { describe, expect, it } from 'vitest'
import {
  axialCoupling,
  beamAt,
  beamRadiusAlongPath,
  cavityEigenmodeBeam,
  couplingMap,
  mismatchFamily,
  pathCoupling,
  planModeMatching,
} from '../../../shared/beam'
import { expectPrintedDigits } from '../cavity/digits'
import { circularBeam, engineErrorOf } from './helpers'

// Physics: ABCD law (Kogelnik & Li, Appl. Opt. 5, 1550 (1966)); check values from OPTICS-CHECKS §2(e).
const lambdaNm = 1064

describe('beamRadiusAlongPath', () => {
  const beam = { wavelengthNm: lambdaNm, x: { waistRadiusMm: 0.5, waistPositionMm: -100, m2: 1.2 }, y: { waistRadiusMm: 0.4, waistPositionMm: 0, m2: 1 } }
  const lenses = [{ zMm: 200, focalLengthMm: 150 }, { zMm: 420, focalLengthMm: -75 }]

  it('when sampled then every radius equals the single-plane result and the lens planes are included', () => {
    const curve = beamRadiusAlongPath(beam, lenses, -50, 600, 66)
    expect(curve.zMm.length).toBe(68)
    expect(Array.from(curve.zMm)).toEqual(expect.arrayContaining([200, 420]))
    for (let i = 0; i < curve.zMm.length; i += 7) {
      const state = beamAt(beam, lenses, curve.zMm[i])
      expect(curve.radiusXMm[i]).toBeCloseTo(state.x.radiusMm, 12)
      expect(curve.radiusYMm[i]).toBeCloseTo(state.y.radiusMm, 12)
    }
  })

  it('when a beam passes a thin lens then its radius is continuous there (only the curvature jumps)', () => {
    // Thin lens: A = 1, B = 0 keeps the ray height (Siegman, "Lasers" (1986), ch. 15).
    const before = beamRadiusAlongPath(beam, lenses, 199.999999, 200, 2).radiusXMm[0]
    const after = beamRadiusAlongPath(beam, lenses, 200, 200.000001, 2).radiusXMm[1]
    expect(Math.abs(before - after)).toBeLessThan(1e-8)
  })

  it('when the range is empty or the point count absurd then it refuses', () => {
    expect(engineErrorOf(() => beamRadiusAlongPath(beam, lenses, 10, 10)).message).toMatch(/zToMm/)
    expect(engineErrorOf(() => beamRadiusAlongPath(beam, lenses, 0, 10, 1)).message).toMatch(/points/)
  })
})

describe('couplingMap', () => {
  const cavity = { wavelengthNm: lambdaNm, lengthMm: 100, roc1Mm: 250, roc2Mm: 250 }
  const path = { beam: circularBeam(0.45, -30), target: cavityEigenmodeBeam(cavity), cavityPlaneMm: 600 }

  const astigmatic = { ...circularBeam(0.45, -30), y: { waistRadiusMm: 0.6, waistPositionMm: 20, m2: 1.1 } }
  for (const [name, beam] of [['circular', circularBeam(0.45, -30)], ['astigmatic', astigmatic]] as const) {
    it(`when mapped over both lens positions (${name} beam) then each cell is the coupling of that arrangement and the best cell matches the kit search`, () => {
      const path = { beam, target: cavityEigenmodeBeam(cavity), cavityPlaneMm: 600 }
      const map = couplingMap(path, { focalLengthMm: 100 }, { focalLengthMm: 200 }, { aMm: [50, 250], bMm: [300, 500] }, 2)
      expect(map.aZMm.length).toBe(101)
      expect(map.coupling.length).toBe(101 * 101)
      const i = 37
      const j = 64
      const direct = pathCoupling(path, [{ zMm: map.aZMm[i], focalLengthMm: 100 }, { zMm: map.bZMm[j], focalLengthMm: 200 }]).coupling
      expect(map.coupling[i * map.bZMm.length + j]).toBeCloseTo(direct, 12)
      const plan = planModeMatching(
        { cavity, beam, kit: [{ id: 'a', focalLengthMm: 100, count: 1 }, { id: 'b', focalLengthMm: 200, count: 1 }], table: { laserToCavityMm: 600, lensZonesMm: [[50, 250], [300, 500]], positionStepMm: 2 } },
        { rankBy: 'coupling', maxArrangements: 50 },
      )
      const searched = plan.arrangements.find((a) => a.lenses.map((l) => l.id).join() === 'a,b')
      expect(searched?.coupling).toBeCloseTo(map.best.coupling, 12)
      expect(searched?.lenses.map((l) => l.zMm)).toEqual([map.best.aZMm, map.best.bZMm])
    })
  }

  it('when the lenses would stand closer than the spacing then the cell is empty (NaN)', () => {
    const map = couplingMap(path, { focalLengthMm: 100 }, { focalLengthMm: 200 }, { aMm: [100, 120], bMm: [100, 120] }, 5, { minSpacingMm: 10 })
    expect(Number.isNaN(map.coupling[0])).toBe(true) // both at 100 mm
    expect(Number.isNaN(map.coupling[2])).toBe(false) // 100 mm and 110 mm
  })
})

describe('mismatchFamily', () => {
  // OPTICS-CHECKS §2(e): mismatch power goes to LG_p0 with P = (1 − M) M^p (derived and checked there); order 2
  // carries the mismatch to lowest order (Miller & Evans, arXiv:1410.8773 (2014); Anderson, Appl. Opt. 23, 2944
  // (1984), from memory).
  const mode = { waistRadiusMm: 0.1, rayleighRangeMm: (Math.PI * 0.01) / (lambdaNm * 1e-6) }

  it('when the order-2 share is the exact LG10 term then M, the pure size ratio and the pure position error match the printed rows', () => {
    const sizeRow = mismatchFamily(0.00894777091, mode, { includeHigherOrders: true })
    expectPrintedDigits(sizeRow.mismatch, '0.00902929915')
    expect(sizeRow.pureSize.largerRatio).toBeCloseTo(1.1, 8)
    const positionRow = mismatchFamily(0.0270997964, mode, { includeHigherOrders: true })
    expectPrintedDigits(positionRow.coupling, '0.972123081')
    expect(positionRow.purePositionMm).toBeCloseTo(10, 6)
  })

  it('when a share is given then every point of the family couples with η = 1 − share and the family runs from pure size to position errors', () => {
    const family = mismatchFamily(0.05, mode, { points: 37 })
    expect(family.coupling).toBeCloseTo(0.95, 15)
    for (const p of family.points) {
      const eta = axialCoupling({ waistRadius1Mm: mode.waistRadiusMm, waistRadius2Mm: p.waistRadiusMm, waistSeparationMm: p.waistPositionErrorMm, wavelengthNm: lambdaNm })
      expect(eta).toBeCloseTo(0.95, 12)
    }
    expect(family.points[0].waistPositionErrorMm).toBeCloseTo(0, 12)
    expect(family.points[0].waistRatio).toBeCloseTo(family.pureSize.largerRatio, 12)
    expect(family.points[18].waistRatio).toBeCloseTo(family.pureSize.smallerRatio, 12)
    expect(Math.max(...family.points.map((p) => p.waistPositionErrorMm))).toBeGreaterThan(family.purePositionMm * 0.9)
  })

  it('when the share is impossible then it says why', () => {
    expect(engineErrorOf(() => mismatchFamily(1.2, mode)).message).toMatch(/order2Share/)
    expect(engineErrorOf(() => mismatchFamily(0.3, mode, { includeHigherOrders: true })).message).toMatch(/0\.25/)
  })
})

describe('path checks', () => {
  it('when the path is malformed then pathCoupling and couplingMap name the problem', () => {
    const target = cavityEigenmodeBeam({ wavelengthNm: lambdaNm, lengthMm: 100, roc1Mm: 250, roc2Mm: 250 })
    const beam = circularBeam(0.45, 0)
    expect(engineErrorOf(() => pathCoupling({ beam, target, cavityPlaneMm: NaN }, [])).message).toMatch(/cavityPlaneMm/)
    expect(engineErrorOf(() => pathCoupling({ beam: circularBeam(0.45, 0, 780), target, cavityPlaneMm: 600 }, [])).code).toBe('wavelength_mismatch')
    expect(engineErrorOf(() => pathCoupling({ beam, target, cavityPlaneMm: 600 }, [{ zMm: 100, focalLengthMm: 0 }])).code).toBe('invalid_lens')
    expect(engineErrorOf(() => couplingMap({ beam, target, cavityPlaneMm: 600 }, { focalLengthMm: 100 }, { focalLengthMm: 50 }, { aMm: [0, 10], bMm: [20, 10] })).message).toMatch(/ranges\.bMm/)
  })
})

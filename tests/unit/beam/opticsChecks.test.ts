import { describe, expect, it } from 'vitest'
import {
  applyAbcd,
  axialCoupling,
  beamAt,
  beamCoupling,
  beamParameterAt,
  cavityEigenmodeBeam,
  coaxialCoupling,
  composeMatrices,
  freeSpaceMatrix,
  idealSingleLens,
  pathCoupling,
  thinLensMatrix,
  waistAfterLenses,
} from '../../../shared/beam'
import { expectPrintedDigits } from '../cavity/digits'
import { circularBeam } from './helpers'

// Check values: the project's optics reference OPTICS-CHECKS.md §2(b), 2(d) and 2(e) (computed there with
// numpy/scipy and cross-checked by an independent route), quoted exactly as printed there. The beam module works in
// mm; values printed in m or µm are converted here, and each is held to the digits printed.
const lambdaNm = 1064

describe('q through free space and a thin lens (OPTICS-CHECKS §2(d))', () => {
  // Source: ABCD law — Kogelnik & Li, Appl. Opt. 5, 1550 (1966); lens formulas — Saleh & Teich, "Fundamentals of
  // Photonics" (1991), ch. 3.
  const rows = [
    { w0Mm: 0.5, sMm: 1000, fMm: 200, zRin: '0.738156169', wLensUm: '841.915214', magnification: '0.183735812', newWaistUm: '91.8679062', sPrime: '0.227007079' },
    { w0Mm: 1, sMm: 0, fMm: 100, zRin: '2.95262467', wLensUm: '1000', magnification: '0.0338487643', newWaistUm: '33.8487643', sPrime: '0.0998854261' },
    { w0Mm: 0.3, sMm: 250, fMm: 100, zRin: '0.265736221', wLensUm: '411.893752', magnification: '0.327709063', newWaistUm: '98.312719', sPrime: '0.116108985' },
  ]
  for (const row of rows) {
    it(`when a ${row.w0Mm} mm waist meets f = ${row.fMm} mm after ${row.sMm} mm then the new waist and its distance match`, () => {
      const beam = circularBeam(row.w0Mm, 0)
      const lenses = [{ zMm: row.sMm, focalLengthMm: row.fMm }]
      expectPrintedDigits(beamParameterAt(beam.x, lambdaNm, 0).im / 1000, row.zRin)
      // A sample at the lens position is just after it; the radius is continuous there.
      expectPrintedDigits(beamAt(beam, lenses, row.sMm).x.radiusMm * 1000, row.wLensUm)
      const image = waistAfterLenses(beam, lenses)
      expectPrintedDigits(image.x.waistRadiusMm * 1000, row.newWaistUm)
      expectPrintedDigits(image.x.waistRadiusMm / row.w0Mm, row.magnification)
      expectPrintedDigits((image.x.waistPositionMm - row.sMm) / 1000, row.sPrime)
    })
  }

  it('when the first row is followed through the lens then q, R and z_R after it match the printed intermediates', () => {
    const state = beamAt(circularBeam(0.5, 0), [{ zMm: 1000, focalLengthMm: 200 }], 1000).x
    expectPrintedDigits(state.q.re / 1000, '-0.227007079')
    expectPrintedDigits(state.q.im / 1000, '0.0249193024')
    expectPrintedDigits(state.curvatureRadiusMm / 1000, '-0.229742552')
    expectPrintedDigits(state.distanceToWaistMm / 1000, '0.227007079')
    // The same through explicit matrices: lens after 1 m of free space.
    const q = applyAbcd({ re: 0, im: 738.156169 }, composeMatrices(freeSpaceMatrix(1000), thinLensMatrix(200)))
    expectPrintedDigits(q.re / 1000, '-0.227007079')
  })

  // Two-lens chains: w0 = 0.3 mm at z = 0, f1 = 100 mm at 500 mm, f2 = 150 mm at 500 + d2.
  const chains = [
    { d2: 250, a: '-1.5', bM: '-0.5', cPerM: '0', d: '-0.666667', wLens2Um: '721.890471', waistUm: '450', afterM: '-0.75' },
    { d2: 300, a: '-2', bM: '-0.7', cPerM: '3.33333', d: '0.666667', wLens2Um: '992.223095', waistUm: '270.603897', afterM: '0.762725487' },
  ]
  for (const row of chains) {
    it(`when two lenses stand ${row.d2} mm apart then the system matrix, the spot on lens 2 and the final waist match`, () => {
      const m = composeMatrices(freeSpaceMatrix(500), thinLensMatrix(100), freeSpaceMatrix(row.d2), thinLensMatrix(150))
      expectPrintedDigits(m.a, row.a)
      expectPrintedDigits(m.b / 1000, row.bM)
      expect(Math.abs(m.c * 1000 - Number(row.cPerM))).toBeLessThan(row.cPerM === '0' ? 1e-12 : 5e-6)
      expect(Math.abs(m.d - Number(row.d))).toBeLessThan(5e-7)
      const lenses = [{ zMm: 500, focalLengthMm: 100 }, { zMm: 500 + row.d2, focalLengthMm: 150 }]
      const beam = circularBeam(0.3, 0)
      expectPrintedDigits(beamAt(beam, lenses, 500 + row.d2).x.radiusMm * 1000, row.wLens2Um)
      const image = waistAfterLenses(beam, lenses)
      expectPrintedDigits(image.x.waistRadiusMm * 1000, row.waistUm)
      expectPrintedDigits((image.x.waistPositionMm - 500 - row.d2) / 1000, row.afterM)
    })
  }

  it('when a 0.5 mm waist is matched into the 100 mm / 250 mm cavity with f = 300 mm then the printed "+" distances give 100 % coupling', () => {
    // Single-lens mode matching, Kogelnik & Li 1966 (formula from memory in OPTICS-CHECKS; values [num] there).
    const target = cavityEigenmodeBeam({ wavelengthNm: 1064, lengthMm: 100, roc1Mm: 250, roc2Mm: 250 })
    expectPrintedDigits(target.waistRadiusMm * 1000, '184.033073')
    const d1 = 645.638572
    const d2 = 346.824586
    const path = { beam: circularBeam(0.5, 0), target, cavityPlaneMm: d1 + d2 - target.waistFromEntranceMm }
    expect(pathCoupling(path, [{ zMm: d1, focalLengthMm: 300 }]).coupling).toBeGreaterThan(1 - 1e-12)
    const image = waistAfterLenses(path.beam, [{ zMm: d1, focalLengthMm: 300 }])
    expectPrintedDigits(image.x.waistRadiusMm * 1000, '184.033073')
    // The free-focal-length single-lens solver finds the same lens in a zone around it.
    const ideal = idealSingleLens(path, [[600, 700]])
    expect(ideal?.coupling).toBeGreaterThan(1 - 1e-12)
    expectPrintedDigits((ideal?.lens.zMm ?? 0) / 1000, '0.645638572')
    expect(Math.abs((ideal?.lens.focalLengthMm ?? 0) - 300)).toBeLessThan(1e-6)
  })
})

describe('cavity eigenmode as the target (OPTICS-CHECKS §2(b))', () => {
  // Source: Kogelnik & Li, Appl. Opt. 5, 1550 (1966); Siegman, "Lasers" (1986), ch. 19.
  it('when the substrate is ignored then the target is the inside waist, referenced to mirror 1', () => {
    const symmetric = cavityEigenmodeBeam({ wavelengthNm: 1064, lengthMm: 100, roc1Mm: 250, roc2Mm: 250 })
    expectPrintedDigits(symmetric.waistRadiusMm * 1000, '184.0331')
    expectPrintedDigits(symmetric.waistFromEntranceMm / 1000, '0.05')
    expectPrintedDigits(symmetric.rayleighRangeMm / 1000, '0.1')
    const asymmetric = cavityEigenmodeBeam({ wavelengthNm: 1064, lengthMm: 200, roc1Mm: 500, roc2Mm: 1000 })
    expectPrintedDigits(asymmetric.waistRadiusMm * 1000, '277.3293')
    expectPrintedDigits(asymmetric.waistFromEntranceMm / 1000, '0.1454545')
    expect(asymmetric.substrateThicknessMm).toBe(0)
  })

  it('when a flat input mirror has a 6.35 mm substrate of index 1.45 then the waist on the coating appears t/n behind the outer face, unchanged in size', () => {
    // A plane-parallel plate of thickness t acts as free space of length t/n (Siegman 1986, ch. 15, ray matrices).
    const target = cavityEigenmodeBeam(
      { wavelengthNm: 1064, lengthMm: 100, roc1Mm: null, roc2Mm: 500 },
      { inputSubstrate: { thicknessMm: 6.35, refractiveIndex: 1.45 } },
    )
    expect(target.waistFromEntranceMm).toBeCloseTo(6.35 / 1.45, 12)
    expectPrintedDigits(target.waistRadiusMm * 1000, '260.2621')
  })

  it('when the input mirror is curved then its substrate acts as a diverging lens and moves the apparent waist', () => {
    // The coated face of a plano-concave substrate is a lens of focal length −R/(n − 1) (lensmaker's equation for a
    // thin plano-concave lens; Siegman 1986, ch. 15); check against a thin-lens model of a very thin substrate.
    const geometry = { wavelengthNm: 1064, lengthMm: 100, roc1Mm: 250, roc2Mm: 250 }
    const thin = cavityEigenmodeBeam(geometry, { inputSubstrate: { thicknessMm: 1e-6, refractiveIndex: 1.5 } })
    const inside = cavityEigenmodeBeam(geometry)
    const f = -250 / 0.5
    const beforeLens = applyAbcd({ re: -50, im: inside.rayleighRangeMm }, thinLensMatrix(-f))
    expect(thin.waistFromEntranceMm).toBeCloseTo(-beforeLens.re, 5)
    expect(thin.rayleighRangeMm).toBeCloseTo(beforeLens.im, 5)
    expect(thin.waistFromEntranceMm).toBeGreaterThan(50)
  })
})

describe('mode-mismatch coupling (OPTICS-CHECKS §2(e))', () => {
  // Source: overlap formula — H. Kogelnik, "Coupling and conversion coefficients for optical modes" (1964) (from
  // memory); Joyce & DeLoach, Appl. Opt. 23, 4187 (1984) (from memory); values [num] in OPTICS-CHECKS against a 2-D
  // overlap integral.
  const rows = [
    { w1: 0.1, w2: 0.11, dz: 0, eta: '0.990970701' },
    { w1: 0.1, w2: 0.1, dz: 10, eta: '0.972123081' },
    { w1: 0.1, w2: 0.12, dz: 20, eta: '0.898256648' },
    { w1: 0.05, w2: 0.2, dz: 0, eta: '0.221453287' },
    { w1: 0.3, w2: 0.25, dz: 150, eta: '0.870840114' },
  ]
  for (const row of rows) {
    it(`when waists ${row.w1 * 1000} µm and ${row.w2 * 1000} µm sit ${row.dz} mm apart then η = ${row.eta} by the waist, q and per-axis forms`, () => {
      expectPrintedDigits(axialCoupling({ waistRadius1Mm: row.w1, waistRadius2Mm: row.w2, waistSeparationMm: row.dz, wavelengthNm: lambdaNm }), row.eta)
      // q form at an arbitrary common plane (37 mm before the first waist): the value must not depend on the plane.
      const q1 = beamParameterAt({ waistRadiusMm: row.w1, waistPositionMm: 0, m2: 1 }, lambdaNm, -37)
      const q2 = beamParameterAt({ waistRadiusMm: row.w2, waistPositionMm: row.dz, m2: 1 }, lambdaNm, -37)
      expectPrintedDigits(coaxialCoupling(q1.re, q1.im, q2.re, q2.im), row.eta)
      // Per-axis product through the general overlap (x and y 1-D overlaps).
      expectPrintedDigits(beamCoupling(circularBeam(row.w1, 0), circularBeam(row.w2, row.dz)).coupling, row.eta)
    })
  }

  it('when the beam is astigmatic then the coupling is the product of the x and y overlaps', () => {
    // Separable Gaussian fields: the 2-D overlap integral factorises (Siegman 1986, ch. 16, Hermite–Gauss modes).
    const cavity = circularBeam(0.1, 0)
    const beam = { wavelengthNm: lambdaNm, x: { waistRadiusMm: 0.11, waistPositionMm: 0, m2: 1 }, y: { waistRadiusMm: 0.1, waistPositionMm: 10, m2: 1 } }
    const result = beamCoupling(cavity, beam)
    expect(result.x * result.x).toBeCloseTo(0.990970701, 9)
    expect(result.y * result.y).toBeCloseTo(0.972123081, 9)
    expect(result.coupling).toBeCloseTo(Math.sqrt(0.990970701 * 0.972123081), 9)
  })
})

describe('misalignment coupling (OPTICS-CHECKS §2(e))', () => {
  // Source: D. Z. Anderson, Appl. Opt. 23, 2944 (1984) and Joyce & DeLoach, Appl. Opt. 23, 4187 (1984) (both from
  // memory): η = exp(−a²/w0² − θ²/θ0²) for identical beams at the waist; unequal waists per OPTICS-CHECKS.
  const identical = [
    { aUm: 10, thetaMrad: 0, eta: '0.990049834' },
    { aUm: 30, thetaMrad: 0, eta: '0.913931185' },
    { aUm: 0, thetaMrad: 0.3, eta: '0.992184508' },
    { aUm: 0, thetaMrad: 1, eta: '0.916512178' },
    { aUm: 20, thetaMrad: 0.5, eta: '0.9400756' },
  ]
  for (const row of identical) {
    it(`when identical 100 µm beams are offset ${row.aUm} µm and tilted ${row.thetaMrad} mrad at the waist then η = ${row.eta}`, () => {
      const beam = circularBeam(0.1, 0)
      const eta = beamCoupling(beam, beam, { offsetXMm: row.aUm / 1000, tiltXRad: row.thetaMrad / 1000 }).coupling
      expectPrintedDigits(eta, row.eta)
    })
  }

  it('when the offset is applied away from the waist then a pure offset still gives exp(−a²/w0²)', () => {
    // OPTICS-CHECKS §2(e): "A pure lateral offset of identical beams gives exp(−a²/w0²) at any plane".
    const beam = circularBeam(0.1, 0)
    expectPrintedDigits(beamCoupling(beam, beam, { atMm: 55, offsetYMm: 0.03 }).coupling, '0.913931185')
  })

  const unequal = [
    { aUm: 20, thetaMrad: 0, eta: '0.936275518' },
    { aUm: 0, thetaMrad: 0.5, eta: '0.942910578' },
    { aUm: 20, thetaMrad: 0.5, eta: '0.912496789' },
  ]
  for (const row of unequal) {
    it(`when 100 µm and 120 µm waists coincide, offset ${row.aUm} µm and tilt ${row.thetaMrad} mrad then η = ${row.eta}`, () => {
      const eta = beamCoupling(circularBeam(0.1, 0), circularBeam(0.12, 0), { offsetXMm: row.aUm / 1000, tiltXRad: row.thetaMrad / 1000 }).coupling
      expectPrintedDigits(eta, row.eta)
    })
  }
})

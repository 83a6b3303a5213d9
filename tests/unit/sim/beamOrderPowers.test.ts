import { describe, expect, it } from 'vitest'
import { overlap1d } from '../../../shared/beam'
import { isEngineError } from '../../../shared/errors'
import { beamOrderPowers, drawBeamMisfit, type BeamMisfit } from '../../../shared/sim'
import { createRandom } from '../../../shared/sim/createRandom'

/** A lab-sized cavity mode for the closed-form comparisons: λ = 1064 nm, w0 = 0.15 mm (q in mm). */
const wavelengthNm = 1064
const w0Mm = 0.15
const zR0Mm = (Math.PI * w0Mm ** 2) / (wavelengthNm * 1e-6)
const theta0Rad = (wavelengthNm * 1e-6) / (Math.PI * w0Mm)

const sum = (values: number[]) => values.reduce((total, v) => total + v, 0)
const factorial = (n: number): number => (n <= 1 ? 1 : n * factorial(n - 1))

/**
 * TEM00 share from the project's closed-form overlap, both beams compared at the plane `planeMm` downstream of the
 * cavity waist. overlap1d puts the tilt into the phase as exp(+ikθx); with its own field exp(−ikx²/2q) that is a beam
 * turned towards −x, so a beam moving towards +x enters with tiltRad = −θ (checked by the moved-plane test below).
 */
function closedFormFundamental(misfit: BeamMisfit, planeMm = 0): number {
  const { offsetX = 0, offsetY = 0, tiltX = 0, tiltY = 0, waistRatio = 1, waistShiftRayleigh = 0 } = misfit
  const cavity = { re: planeMm, im: zR0Mm }
  const input = { re: planeMm - waistShiftRayleigh * zR0Mm, im: waistRatio ** 2 * zR0Mm }
  const axis = (offset: number, tilt: number) =>
    overlap1d(cavity, input, wavelengthNm, { offsetMm: offset * w0Mm + tilt * theta0Rad * planeMm, tiltRad: -tilt * theta0Rad })
  return axis(offsetX, tiltX) * axis(offsetY, tiltY)
}

function randomMisfit(seed: number, size: number): BeamMisfit {
  const random = createRandom(seed)
  const spread = () => size * (2 * random.uniform() - 1)
  return {
    offsetX: spread(),
    offsetY: spread(),
    tiltX: spread(),
    tiltY: spread(),
    waistRatio: Math.exp(0.4 * spread()),
    waistShiftRayleigh: spread(),
  }
}

function errorOf(action: () => unknown): { code: string; message: string } {
  try {
    action()
  } catch (error) {
    if (isEngineError(error)) return { code: error.code, message: error.message }
    throw error
  }
  throw new Error('expected an EngineError')
}

describe('beamOrderPowers', () => {
  it('when the beam is matched and aligned then all power is in TEM00', () => {
    const shares = beamOrderPowers({}, { maxOrder: 12 })
    expect(shares).toHaveLength(13)
    expect(Math.abs(shares[0] - 1)).toBeLessThan(1e-9)
    for (const share of shares.slice(1)) expect(share).toBeLessThan(1e-12)
  })

  it('when the beam is misaligned and mismatched then P_0 equals the closed-form overlap of overlap1d', () => {
    for (let seed = 1; seed <= 12; seed++) {
      const misfit = randomMisfit(seed, 1.5)
      const [fundamental] = beamOrderPowers(misfit, { maxOrder: 0 })
      expect(Math.abs(fundamental - closedFormFundamental(misfit))).toBeLessThan(1e-6)
    }
  })

  it('when the comparison plane moves downstream with the offset grown by tilt × distance then P_0 still agrees', () => {
    // Coupling does not depend on the plane where it is evaluated; a positive tilt carries the beam towards +x.
    // Here the input waist lies z_R0 downstream, where this beam is 0.8 + 0.6 = 1.4 w0 off axis in x (θ0·z_R0 = w0).
    const misfit: BeamMisfit = { offsetX: 0.8, tiltX: 0.6, offsetY: 0.4, tiltY: 0.7, waistRatio: 0.8, waistShiftRayleigh: 1 }
    const [fundamental] = beamOrderPowers(misfit, { maxOrder: 0 })
    for (const planeMm of [0.7 * zR0Mm, 3 * zR0Mm]) {
      expect(Math.abs(fundamental - closedFormFundamental(misfit, planeMm))).toBeLessThan(1e-6)
    }
    // Tilted back towards the axis the beam is nearly centred at its waist and couples far better; so the check above
    // can tell the two signs apart.
    const [reversed] = beamOrderPowers({ ...misfit, tiltX: -0.6, tiltY: -0.7 }, { maxOrder: 0 })
    expect(reversed).toBeGreaterThan(fundamental + 0.2)
  })

  it('when the beam is only offset or tilted then the shares are Poisson with mean (a/w0)² + (θ/θ0)²', () => {
    // The displaced TEM00 is the oscillator's coherent state: |c_n|² = e^(−x̄) x̄ⁿ / n! with x̄ = (a/w0)² for a field
    // exp(−(x − a)²/w0²), and the tilt adds (θ/θ0)². Independent axes add their means (Poisson sums are Poisson).
    // Sources: Siegman, "Lasers" (1986), ch. 16 (Hermite–Gaussians as oscillator eigenfunctions); Gerry & Knight,
    // "Introductory Quantum Optics" (2005), ch. 3 (coherent states) (both from memory).
    const cases: [BeamMisfit, number][] = [
      [{ offsetX: 0.3 }, 0.09],
      [{ offsetX: -0.8 }, 0.64],
      [{ offsetY: 1.5 }, 2.25],
      [{ tiltX: 1.2 }, 1.44],
      [{ offsetX: 0.5, tiltX: -0.9 }, 0.25 + 0.81],
      [{ offsetX: 0.7, tiltY: 0.6, offsetY: -0.2 }, 0.49 + 0.36 + 0.04],
    ]
    for (const [misfit, mean] of cases) {
      const shares = beamOrderPowers(misfit, { maxOrder: 6 })
      for (let n = 0; n <= 6; n++) {
        expect(Math.abs(shares[n] - (Math.exp(-mean) * mean ** n) / factorial(n))).toBeLessThan(1e-6)
      }
    }
  })

  it('when only the waist size differs then odd orders are empty and P_2 = P_0 · ρ² with ρ = (w1² − w0²)/(w1² + w0²)', () => {
    // Per axis |c_2|²/|c_0|² = ρ²/2 and |c_0|² = 2 w0 w1/(w0² + w1²); the round beam has P_0 = |c_0|⁴ and
    // P_2 = |c_0|²|c_2|² + |c_1|⁴ + |c_2|²|c_0|² = 2|c_0|⁴ ρ²/2 = P_0 ρ² (c_1 = 0). Derived here from the generating
    // function of H_n (Siegman ch. 16, from memory).
    for (const waistRatio of [0.6, 1.5, 2.5]) {
      const shares = beamOrderPowers({ waistRatio }, { maxOrder: 9 })
      for (let n = 1; n <= 9; n += 2) expect(shares[n]).toBeLessThan(1e-12)
      const rho = (waistRatio ** 2 - 1) / (waistRatio ** 2 + 1)
      const fundamental = ((2 * waistRatio) / (1 + waistRatio ** 2)) ** 2
      expect(Math.abs(shares[0] - fundamental)).toBeLessThan(1e-6)
      expect(Math.abs(shares[2] - fundamental * rho ** 2)).toBeLessThan(1e-6)
    }
  })

  it('when the waist is also shifted then the even orders fall geometrically: P_2m = (1 − |ρ|²)|ρ|^2m, ρ = (1 − b)/(1 + b)', () => {
    // With E ∝ exp(−b ξ²), b = i/q̃ and q̃ = −s + i r² (units of z_R0, ξ = x/w0): ∫H_n(√2ξ) e^(−ξ²) E dξ comes from
    // Σ Hₙ τⁿ/n! = exp(2yτ − τ²), giving |c_2j|²/|c_0|² = C(2j, j) |ρ|^2j / 4^j per axis; the round beam sums these
    // with Σ_j C(2j, j) C(2m − 2j, m − j) = 4^m. Derived here (identity from memory: Graham, Knuth & Patashnik,
    // "Concrete Mathematics", ch. 5).
    for (const [waistRatio, waistShiftRayleigh] of [[1, 0.9], [0.7, -0.5], [1.6, 1.4]]) {
      const shares = beamOrderPowers({ waistRatio, waistShiftRayleigh }, { maxOrder: 8 })
      const qAbs2 = waistShiftRayleigh ** 2 + waistRatio ** 4
      const bRe = waistRatio ** 2 / qAbs2
      const bIm = -waistShiftRayleigh / qAbs2
      const rho2 = ((1 - bRe) ** 2 + bIm ** 2) / ((1 + bRe) ** 2 + bIm ** 2)
      for (let m = 0; m <= 4; m++) expect(Math.abs(shares[2 * m] - (1 - rho2) * rho2 ** m)).toBeLessThan(1e-6)
      for (let n = 1; n <= 7; n += 2) expect(shares[n]).toBeLessThan(1e-12)
    }
  })

  it('when the misfit is moderate then the shares up to N = 20 add up to 1 and never exceed it', () => {
    for (let seed = 101; seed <= 110; seed++) {
      const shares = beamOrderPowers(randomMisfit(seed, 0.8), { maxOrder: 20 })
      expect(Math.abs(sum(shares) - 1)).toBeLessThan(1e-6)
      expect(sum(shares)).toBeLessThanOrEqual(1 + 1e-12)
      for (const share of shares) expect(share).toBeGreaterThanOrEqual(0)
    }
  })

  it('when the misfit is large then the shares up to maxOrder hold less than 1 and the rest is in higher orders', () => {
    const low = sum(beamOrderPowers({ offsetX: 3, waistRatio: 0.4 }, { maxOrder: 5 }))
    const high = sum(beamOrderPowers({ offsetX: 3, waistRatio: 0.4 }, { maxOrder: 40 }))
    expect(low).toBeLessThan(0.5)
    expect(high).toBeGreaterThan(low + 0.3)
    expect(high).toBeLessThanOrEqual(1 + 1e-12)
  })

  it('when an input is out of range then an EngineError names the field, the range and the value', () => {
    expect(errorOf(() => beamOrderPowers({ waistRatio: -1 }))).toEqual({
      code: 'invalid_sim_options',
      message: 'waistRatio must be a number from 0.02 to 50, got -1',
    })
    expect(errorOf(() => beamOrderPowers({ offsetX: Number.NaN })).message).toBe('offsetX must be a number from -10 to 10, got NaN')
    expect(errorOf(() => beamOrderPowers({ tiltY: Infinity })).message).toBe('tiltY must be a number from -10 to 10, got Infinity')
    expect(errorOf(() => beamOrderPowers({ waistShiftRayleigh: '1' as unknown as number })).message).toBe(
      'waistShiftRayleigh must be a number from -50 to 50, got 1',
    )
    expect(errorOf(() => beamOrderPowers(null as unknown as BeamMisfit)).message).toMatch(/^misfit must be an object/)
    expect(errorOf(() => beamOrderPowers({}, { maxOrder: 2.5 })).message).toBe('maxOrder must be an integer from 0 to 40, got 2.5')
    expect(errorOf(() => beamOrderPowers({}, { maxOrder: 41 })).message).toBe('maxOrder must be an integer from 0 to 40, got 41')
  })
})

describe('drawBeamMisfit', () => {
  it('when a TEM00 share from 0.05 to 0.99 is asked for then the drawn misfit gives it within 0.005', () => {
    for (const target of [0.05, 0.2, 0.5, 0.9, 0.99]) {
      for (let seed = 1; seed <= 6; seed++) {
        const shares = beamOrderPowers(drawBeamMisfit(createRandom(seed), target), { maxOrder: 20 })
        expect(Math.abs(shares[0] - target)).toBeLessThan(0.005)
        expect(sum(shares)).toBeLessThanOrEqual(1 + 1e-12)
        for (const share of shares) expect(share).toBeGreaterThanOrEqual(0)
      }
    }
  })

  it('when drawn then every kind of error is present on both axes, and the seed alone decides the draw', () => {
    const misfit = drawBeamMisfit(createRandom(21), 0.6)
    for (const value of [misfit.offsetX, misfit.offsetY, misfit.tiltX, misfit.tiltY, misfit.waistShiftRayleigh]) expect(value).not.toBe(0)
    expect(misfit.waistRatio).not.toBe(1)
    expect(drawBeamMisfit(createRandom(21), 0.6)).toEqual(misfit)
    expect(drawBeamMisfit(createRandom(22), 0.6)).not.toEqual(misfit)
  })

  it('when the target is 1 then the misfit is zero, and a target outside 0.01 … 1 is refused by name', () => {
    expect(beamOrderPowers(drawBeamMisfit(createRandom(1), 1), { maxOrder: 0 })[0]).toBeCloseTo(1, 12)
    expect(errorOf(() => drawBeamMisfit(createRandom(1), 0))).toEqual({
      code: 'invalid_sim_options',
      message: 'targetFundamental must be a number from 0.01 to 1, got 0',
    })
    expect(errorOf(() => drawBeamMisfit(createRandom(1), Number.NaN)).message).toBe('targetFundamental must be a number from 0.01 to 1, got NaN')
  })

  it('when called 200 times as the suites do then each call takes well under 5 ms', () => {
    const random = createRandom(5)
    const started = performance.now()
    for (let k = 0; k < 200; k++) beamOrderPowers(drawBeamMisfit(random, 0.05 + 0.94 * random.uniform()), { maxOrder: 20 })
    // A generous budget (measured: about 1 ms per draw and evaluation together), so a busy machine does not fail it.
    expect((performance.now() - started) / 200).toBeLessThan(5)
  })
})

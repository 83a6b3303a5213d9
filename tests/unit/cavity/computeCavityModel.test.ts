import { describe, expect, it } from 'vitest'
import { cavityGeometrySchema, computeCavityModel, type CavityGeometry } from '../../../shared/cavity'
import { EngineError } from '../../../shared/errors'
import { expectPrintedDigits } from './digits'

function engineErrorOf(action: () => unknown): EngineError {
  try {
    action()
  } catch (error) {
    if (error instanceof EngineError) return error
    throw error
  }
  throw new Error('expected an EngineError')
}

describe('computeCavityModel', () => {
  it('when given the brief example (1064 nm, L = 100 mm, R = 250 mm, R = 0.99) then every field matches the check values', () => {
    // OPTICS-CHECKS.md §2(a)–(c); Kogelnik & Li, Appl. Opt. 5, 1550 (1966); Born & Wolf §7.6.
    const model = computeCavityModel({ wavelengthNm: 1064, lengthMm: 100, roc1Mm: 250, roc2Mm: 250, reflectivity1: 0.99, reflectivity2: 0.99 })
    expect(model.stable).toBe(true)
    expectPrintedDigits(model.g1, '0.6')
    expectPrintedDigits(model.g2, '0.6')
    expectPrintedDigits(model.fsrHz, '1498962290')
    expectPrintedDigits(model.gouyOneWayRad, '0.927295218')
    expectPrintedDigits(model.waist.radiusM * 1e6, '184.0331')
    expectPrintedDigits(model.waist.positionFromMirror1M, '0.05')
    expectPrintedDigits(model.rayleighRangeM, '0.1')
    expectPrintedDigits(model.spotRadiusM.mirror1 * 1e6, '205.7552')
    expectPrintedDigits(model.spotRadiusM.mirror2 * 1e6, '205.7552')
    expectPrintedDigits(model.designFinesse as number, '312.584522')
    expectPrintedDigits((model.designLinewidthHz as number) / 1e6, '4.79538231')
    expect(model.degenerateOrders).toEqual([])
  })

  it('when reflectivities are missing then design finesse and linewidth are null', () => {
    const model = computeCavityModel({ wavelengthNm: 1064, lengthMm: 100, roc1Mm: 250, roc2Mm: 250 })
    expect(model.designFinesse).toBeNull()
    expect(model.designLinewidthHz).toBeNull()
  })

  it('when a mirror is flat (null radius) then its g is 1 and the waist sits on it', () => {
    // OPTICS-CHECKS.md §2(b), plano-concave row; Kogelnik & Li 1966.
    const model = computeCavityModel({ wavelengthNm: 1064, lengthMm: 100, roc1Mm: null, roc2Mm: 500 })
    expect(model.g1).toBe(1)
    expect(model.waist.positionFromMirror1M).toBe(0)
    expectPrintedDigits(model.waist.radiusM * 1e6, '260.2621')
  })

  it('when the cavity is symmetric confocal then ψ = π/2, the waist is finite and all even orders are degenerate with TEM00', () => {
    // OPTICS-CHECKS.md §2(a)–(b), confocal rows; Siegman 1986 ch. 19.
    const model = computeCavityModel({ wavelengthNm: 632.8, lengthMm: 50, roc1Mm: 50, roc2Mm: 50 })
    expect(model.gouyOneWayRad).toBeCloseTo(Math.PI / 2, 14)
    expectPrintedDigits(model.waist.radiusM * 1e6, '70.9624')
    const pairs = model.degenerateOrders.map((d) => d.orders.join('-'))
    expect(pairs).toContain('0-2')
    expect(pairs).toContain('0-8')
    expect(pairs).toContain('1-3')
    expect(pairs).not.toContain('0-1')
    expect(model.degenerateOrders.every((d) => d.separationFsr < 1e-9)).toBe(true)
  })

  it('when the cavity is half-confocal then order 4 is degenerate with TEM00 and order 2 is not', () => {
    // OPTICS-CHECKS.md §2(a): ψ = π/4, orders 4, 8, … coincide with TEM00.
    const model = computeCavityModel({ wavelengthNm: 1064, lengthMm: 50, roc1Mm: null, roc2Mm: 100 })
    const pairs = model.degenerateOrders.map((d) => d.orders.join('-'))
    expect(pairs).toContain('0-4')
    expect(pairs).toContain('4-8')
    expect(pairs).not.toContain('0-2')
  })

  it('when two orders are within the degeneracy window then they are flagged, and not when the window is narrowed', () => {
    // Near-planar (R = 10 m, L = 0.1 m): order N sits at N·0.0450534 FSR (OPTICS-CHECKS.md §2(a)), so neighbouring
    // orders are 0.045 FSR apart; a finesse-20 linewidth (0.05 FSR) × 3 covers that gap, a finesse-2000 one does not.
    const geometry: CavityGeometry = { wavelengthNm: 1064, lengthMm: 100, roc1Mm: 10000, roc2Mm: 10000 }
    const wide = computeCavityModel(geometry, { linewidthFsr: 1 / 20, maxOrder: 2 })
    expect(wide.degenerateOrders.map((d) => d.orders.join('-'))).toEqual(['0-1', '0-2', '1-2'])
    expectPrintedDigits(wide.degenerateOrders[0].separationFsr, '0.04505341')
    const narrow = computeCavityModel(geometry, { linewidthFsr: 1 / 2000, maxOrder: 2 })
    expect(narrow.degenerateOrders).toEqual([])
  })

  it('when offsets straddle the FSR boundary then their separation wraps around (0.99 and 0.01 are 0.02 apart)', () => {
    // Near-concentric: order 8 at 8·0.874334084 mod 1 = 0.994673 FSR, 0.0053 FSR from TEM00 at 0 (OPTICS-CHECKS.md §2(a)).
    const model = computeCavityModel({ wavelengthNm: 1064, lengthMm: 100, roc1Mm: 52, roc2Mm: 52 }, { linewidthFsr: 0.002 })
    const pair = model.degenerateOrders.find((d) => d.orders[0] === 0 && d.orders[1] === 8)
    expect(pair).toBeDefined()
    expect(pair?.separationFsr).toBeCloseTo(1 - ((8 * 0.874334084) % 1), 6)
  })

  const unstable: Array<[string, Partial<CavityGeometry>]> = [
    ['g1·g2 > 1 (L = 300 mm, R = 100 mm)', { lengthMm: 300, roc1Mm: 100, roc2Mm: 100 }],
    ['g1·g2 < 0 (L = 250 mm, R = 200 mm and 1000 mm)', { lengthMm: 250, roc1Mm: 200, roc2Mm: 1000 }],
    ['planar–planar (g1 = g2 = 1, on the edge)', { lengthMm: 100, roc1Mm: null, roc2Mm: null }],
    ['concentric (L = 2R, g1 = g2 = −1, on the edge)', { lengthMm: 100, roc1Mm: 50, roc2Mm: 50 }],
    ['hemispherical (flat + R = L, g1·g2 = 0, on the edge)', { lengthMm: 100, roc1Mm: null, roc2Mm: 100 }],
  ]
  for (const [name, geometry] of unstable) {
    it(`when the cavity is ${name} then it throws unstable_cavity naming g1, g2 and the product`, () => {
      // Stability 0 < g1 g2 < 1 (edges excluded: no finite waist): Kogelnik & Li, Appl. Opt. 5, 1550 (1966).
      const error = engineErrorOf(() => computeCavityModel({ wavelengthNm: 1064, lengthMm: 100, roc1Mm: null, roc2Mm: null, ...geometry }))
      expect(error.code).toBe('unstable_cavity')
      expect(error.message).toMatch(/g1 = -?[\d.]+, g2 = -?[\d.]+, g1·g2 = -?[\d.]+/)
    })
  }

  it('when the wavelength is given in micrometres then it throws invalid_geometry naming the field', () => {
    const error = engineErrorOf(() => computeCavityModel({ wavelengthNm: 1.064, lengthMm: 100, roc1Mm: 250, roc2Mm: 250 }))
    expect(error.code).toBe('invalid_geometry')
    expect(error.message).toContain('wavelengthNm')
    expect(error.details?.field).toBe('wavelengthNm')
  })

  it('when an option is absurd then it throws invalid_argument', () => {
    const geometry: CavityGeometry = { wavelengthNm: 1064, lengthMm: 100, roc1Mm: 250, roc2Mm: 250 }
    expect(() => computeCavityModel(geometry, { maxOrder: -1 })).toThrow('maxOrder must be an integer from 0 to 1000')
    expect(() => computeCavityModel(geometry, { linewidthFsr: 0 })).toThrow('linewidthFsr must be a positive number')
  })
})

describe('cavityGeometrySchema', () => {
  const valid = { wavelengthNm: 1064, lengthMm: 100, roc1Mm: 250, roc2Mm: null }

  it('when the geometry is sensible then it parses, keeping null for a flat mirror and a negative radius for a convex one', () => {
    expect(cavityGeometrySchema.parse(valid)).toEqual(valid)
    expect(cavityGeometrySchema.parse({ ...valid, roc2Mm: -500 }).roc2Mm).toBe(-500)
  })

  const refused: Array<[string, Record<string, unknown>, string]> = [
    ['wavelength below 100 nm', { wavelengthNm: 1.064 }, 'wavelengthNm'],
    ['wavelength above 20000 nm', { wavelengthNm: 1064000 }, 'wavelengthNm'],
    ['length below 0.01 mm', { lengthMm: 0.001 }, 'lengthMm'],
    ['length above 100 m', { lengthMm: 1e6 }, 'lengthMm'],
    ['|radius| below 0.1 mm', { roc1Mm: 0.01 }, 'roc1Mm'],
    ['a convex radius below 0.1 mm', { roc2Mm: -0.05 }, 'roc2Mm'],
    ['reflectivity in percent', { reflectivity1: 99 }, 'reflectivity1'],
    ['reflectivity of exactly 1', { reflectivity2: 1 }, 'reflectivity2'],
    ['a negative modulation frequency', { modulationMHz: -10 }, 'modulationMHz'],
    ['a missing mirror radius', { roc2Mm: undefined }, 'roc2Mm'],
    ['a length given as text', { lengthMm: '100' }, 'lengthMm'],
  ]
  for (const [name, change, field] of refused) {
    it(`when given ${name} then it is refused with a message naming ${field}`, () => {
      const result = cavityGeometrySchema.safeParse({ ...valid, ...change })
      expect(result.success).toBe(false)
      const issue = result.error?.issues[0]
      expect(issue?.path).toEqual([field])
      expect(issue?.message).toContain(field)
    })
  }
})

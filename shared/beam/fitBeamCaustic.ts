import { EngineError, type EngineWarning } from '../errors'
import { assertWavelength } from './assertions'
import { wavelengthMm } from './wavelengthMm'

export interface CausticMeasurements {
  wavelengthNm: number
  /** Measurement positions along the path, mm. */
  zMm: readonly number[]
  /** Measured 1/e² (second-moment) beam radii at those positions, mm. */
  radiusMm: readonly number[]
  /**
   * Standard uncertainty of each radius, mm (one number for all, or one per point). When omitted, every radius is
   * taken to carry the same relative uncertainty and the scale is estimated from the scatter of the fit.
   */
  radiusUncertaintyMm?: number | readonly number[]
}

export interface CausticFitOptions {
  /** Fewer points than this draws a `few_measurements` warning (ISO 11146-1 asks for at least 10; from memory). @default 10 */
  recommendedPoints?: number
}

export interface CausticFit {
  waistRadiusMm: number
  waistPositionMm: number
  m2: number
  rayleighRangeMm: number
  /** Far-field divergence half-angle M²λ/(π w0), rad. */
  divergenceRad: number
  /** One-standard-deviation uncertainties from the propagated covariance of the fit. */
  uncertainty: { waistRadiusMm: number; waistPositionMm: number; m2: number; rayleighRangeMm: number }
  /** Covariance of (w0, z0, M²). */
  covariance: number[][]
  /** Coefficients of w² = A + B z + C z² (mm², mm, dimensionless). */
  coefficients: { a: number; b: number; c: number }
  /** Measured minus fitted radius per point, mm. */
  residualsMm: number[]
  /** χ² / (n − 3) with the given uncertainties (1 by construction when the scale was estimated). */
  reducedChiSquare: number
  /** `given` uncertainties, or scale `estimated` from the residuals. */
  uncertaintySource: 'given' | 'estimated'
  warnings: EngineWarning[]
}

/**
 * ISO 11146-1 hyperbolic fit of one axis: w(z)² = w0² + (M²λ/(π w0))² (z − z0)², fitted as w² = A + B z + C z² by
 * weighted linear least squares on w² (weights 1/σ(w²)², σ(w²) = 2 w σ(w)); then z0 = −B/2C, w0² = A − B²/4C,
 * M² = (π/λ) √(AC − B²/4). The covariance of (A, B, C) is propagated to w0, z0, M² and z_R to first order.
 * Source: ISO 11146-1:2005, "Lasers and laser-related equipment — Test methods for laser beam widths, divergence
 * angles and beam propagation ratios", §9 (section number from memory); Siegman, "Lasers" (1986), ch. 17.
 */
export function fitBeamCaustic(data: CausticMeasurements, options: CausticFitOptions = {}): CausticFit {
  const { recommendedPoints = 10 } = options
  assertWavelength(data.wavelengthNm)
  const z = toNumbers(data.zMm, 'zMm')
  const w = toNumbers(data.radiusMm, 'radiusMm')
  const n = z.length
  if (w.length !== n) throw new EngineError('invalid_measurements', `zMm has ${n} values but radiusMm has ${w.length}; give one radius per position`)
  if (n < 4) throw new EngineError('too_few_measurements', `The hyperbolic fit needs at least 4 beam radii (3 parameters and one degree of freedom); got ${n}`)
  if (w.some((v) => v <= 0)) throw new EngineError('invalid_measurements', 'Every measured radius must be greater than 0 mm')
  const sigmaW = uncertainties(data.radiusUncertaintyMm, w)
  const lambda = wavelengthMm(data.wavelengthNm)

  // Centre and scale z so the normal equations stay well conditioned: u = (z − zMid) / zScale.
  const zMid = z.reduce((s, v) => s + v, 0) / n
  const zScale = Math.max(...z.map((v) => Math.abs(v - zMid))) || 1
  if (new Set(z).size < 3) throw new EngineError('invalid_measurements', 'The beam radii must be measured at 3 or more different positions')
  const normal = [0, 0, 0, 0, 0, 0, 0, 0, 0]
  const rhs = [0, 0, 0]
  for (let i = 0; i < n; i++) {
    const u = (z[i] - zMid) / zScale
    const row = [1, u, u * u]
    const sigmaY = 2 * w[i] * sigmaW[i]
    const weight = 1 / (sigmaY * sigmaY)
    for (let r = 0; r < 3; r++) {
      rhs[r] += weight * row[r] * w[i] * w[i]
      for (let c = 0; c < 3; c++) normal[3 * r + c] += weight * row[r] * row[c]
    }
  }
  const inverse = invert3(normal)
  const [a, b, c] = [0, 1, 2].map((r) => inverse[3 * r] * rhs[0] + inverse[3 * r + 1] * rhs[1] + inverse[3 * r + 2] * rhs[2])
  if (!(c > 0)) {
    throw new EngineError('no_waist_in_fit', 'The measured radii do not narrow to a waist anywhere (w² has no minimum); measure on both sides of the focus')
  }
  const w0Squared = a - (b * b) / (4 * c)
  if (!(w0Squared > 0)) {
    throw new EngineError('no_waist_in_fit', 'The fitted waist radius comes out imaginary (w0² ≤ 0); the radii are too noisy or inconsistent for a hyperbolic fit')
  }

  let chiSquare = 0
  const residualsMm: number[] = []
  const fitted = (zi: number): number => {
    const u = (zi - zMid) / zScale
    return Math.sqrt(Math.max(a + b * u + c * u * u, 0))
  }
  for (let i = 0; i < n; i++) {
    const residualY = w[i] * w[i] - fitted(z[i]) ** 2
    chiSquare += (residualY / (2 * w[i] * sigmaW[i])) ** 2
    residualsMm.push(w[i] - fitted(z[i]))
  }
  const reducedChiSquare = chiSquare / (n - 3)
  const given = data.radiusUncertaintyMm !== undefined
  const scale = given ? 1 : reducedChiSquare
  const cov = inverse.map((v) => v * scale)

  // Derived quantities in the u frame, then back to millimetres.
  const u0 = -b / (2 * c)
  const w0 = Math.sqrt(w0Squared)
  const p = a * c - (b * b) / 4
  const m2 = (Math.PI / lambda) * (Math.sqrt(p) / zScale)
  const rayleighRangeMm = Math.sqrt(w0Squared / c) * zScale
  const gradients = {
    w0: [1 / (2 * w0), -b / (4 * c * w0), (b * b) / (8 * c * c * w0)],
    z0: [0, (-1 / (2 * c)) * zScale, (b / (2 * c * c)) * zScale],
    m2: [c, -b / 2, a].map((g) => ((Math.PI / lambda) * g) / (2 * Math.sqrt(p) * zScale)),
    // z_R = zScale √(w0²/C): d z_R = zScale (d(w0²)/C − w0² dC/C²) / (2 √(w0²/C)).
    zR: [1 / c, -b / (2 * c * c), (b * b) / (4 * c * c * c) - w0Squared / (c * c)].map((g) => (zScale * g) / (2 * Math.sqrt(w0Squared / c))),
  }
  const quad = (g1: number[], g2: number[]): number => {
    let s = 0
    for (let r = 0; r < 3; r++) for (let k = 0; k < 3; k++) s += g1[r] * cov[3 * r + k] * g2[k]
    return s
  }
  const names = ['w0', 'z0', 'm2'] as const
  const covariance = names.map((r) => names.map((k) => quad(gradients[r], gradients[k])))
  const waistPositionMm = zMid + u0 * zScale
  const fit: CausticFit = {
    waistRadiusMm: w0,
    waistPositionMm,
    m2,
    rayleighRangeMm,
    divergenceRad: (m2 * lambda) / (Math.PI * w0),
    uncertainty: {
      waistRadiusMm: Math.sqrt(covariance[0][0]),
      waistPositionMm: Math.sqrt(covariance[1][1]),
      m2: Math.sqrt(covariance[2][2]),
      rayleighRangeMm: Math.sqrt(quad(gradients.zR, gradients.zR)),
    },
    covariance,
    coefficients: {
      // Back to w² = A + B z + C z² in millimetres.
      a: a - (b * zMid) / zScale + (c * zMid * zMid) / (zScale * zScale),
      b: b / zScale - (2 * c * zMid) / (zScale * zScale),
      c: c / (zScale * zScale),
    },
    residualsMm,
    reducedChiSquare,
    uncertaintySource: given ? 'given' : 'estimated',
    warnings: [],
  }
  fit.warnings = causticWarnings(z, fit, recommendedPoints)
  return fit
}

function causticWarnings(z: number[], fit: CausticFit, recommendedPoints: number): EngineWarning[] {
  const warnings: EngineWarning[] = []
  const { waistPositionMm: z0, rayleighRangeMm: zR } = fit
  const before = z.filter((v) => v < z0).length
  const after = z.filter((v) => v > z0).length
  if (before === 0 || after === 0) {
    warnings.push({
      code: 'waist_not_bracketed',
      message: `All measurements lie on one side of the fitted waist (z0 = ${fmt(z0)} mm); the waist position and size are extrapolated. ISO 11146-1 asks for points on both sides of the waist.`,
    })
  }
  const near = z.filter((v) => Math.abs(v - z0) <= zR).length
  const far = z.filter((v) => Math.abs(v - z0) >= 2 * zR).length
  if (near === 0) {
    warnings.push({ code: 'no_points_near_waist', message: `No measurement lies within one Rayleigh range (${fmt(zR)} mm) of the fitted waist; the waist radius is poorly pinned. ISO 11146-1 asks for about half the points there (from memory).` })
  }
  if (far === 0) {
    warnings.push({ code: 'no_points_far_from_waist', message: `No measurement lies beyond two Rayleigh ranges (${fmt(2 * zR)} mm) from the fitted waist; M² and the divergence are poorly pinned. ISO 11146-1 asks for about half the points there (from memory).` })
  }
  if (z.length < recommendedPoints) {
    warnings.push({ code: 'few_measurements', message: `Only ${z.length} measurements; ISO 11146-1 asks for at least ${recommendedPoints} (from memory), so the uncertainties are rough.` })
  }
  // Below 1 by more than its uncertainty (and more than rounding): a perfect beam measured well fits to 0.9999….
  if (fit.m2 < 1 - Math.max(1e-3, 2 * fit.uncertainty.m2)) {
    warnings.push({ code: 'm2_below_one', message: `The fit gives M² = ${fit.m2.toFixed(3)} ± ${fit.uncertainty.m2.toFixed(3)}, below 1, which no real beam has: the radii are noisy, the wavelength is wrong, or the widths are not 1/e² radii. Use the result with care.` })
  }
  return warnings
}

function toNumbers(values: readonly number[], name: string): number[] {
  if (!Array.isArray(values)) throw new EngineError('invalid_measurements', `${name} must be an array of numbers`)
  values.forEach((v, i) => {
    if (typeof v !== 'number' || !Number.isFinite(v)) throw new EngineError('invalid_measurements', `${name}[${i}] must be a finite number, got ${String(v)}`)
  })
  return [...values]
}

function uncertainties(given: number | readonly number[] | undefined, w: number[]): number[] {
  if (given === undefined) return w.map((v) => v) // equal relative uncertainty; the scale comes from the residuals
  const list = typeof given === 'number' ? w.map(() => given) : [...given]
  if (list.length !== w.length || list.some((s) => typeof s !== 'number' || !Number.isFinite(s) || s <= 0)) {
    throw new EngineError('invalid_measurements', 'radiusUncertaintyMm must be one positive number or one positive number per radius')
  }
  return list
}

/** Inverse of a symmetric positive-definite 3×3 matrix (row-major) by cofactors. */
function invert3(m: number[]): number[] {
  const [a, b, c, d, e, f, g, h, i] = m
  const A = e * i - f * h
  const B = -(d * i - f * g)
  const C = d * h - e * g
  const det = a * A + b * B + c * C
  if (!(Math.abs(det) > 0)) throw new EngineError('invalid_measurements', 'The measurement positions do not determine a hyperbola (singular fit)')
  return [A, -(b * i - c * h), b * f - c * e, B, a * i - c * g, -(a * f - c * d), C, -(a * h - b * g), a * e - b * d].map((v) => v / det)
}

function fmt(v: number): string {
  return Number(v.toPrecision(4)).toString()
}

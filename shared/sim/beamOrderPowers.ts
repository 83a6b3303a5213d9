import { assertSimOption, isNumberIn } from './assertSimOption'
import type { SeededRandom } from './createRandom'

/**
 * How an input Gaussian beam misses a cavity's TEM00 eigenmode, in the mode's own units, at the cavity-waist plane.
 * Signs: +x, +y are the transverse axes, +z the propagation direction.
 */
export interface BeamMisfit {
  /** Lateral offset of the input beam's axis at the cavity waist, in cavity waist radii w0. @default 0 */
  offsetX?: number
  /** @default 0 */
  offsetY?: number
  /**
   * Tilt of the input beam's axis in units of the cavity mode's far-field divergence θ0 = λ/(π w0); positive means
   * the beam moves towards +x (+y) as it propagates, so offset and tilt of the same sign add further downstream.
   * @default 0
   */
  tiltX?: number
  /** @default 0 */
  tiltY?: number
  /** Input waist radius over the cavity waist radius w0 (1 = matched; round beam, same on both axes). @default 1 */
  waistRatio?: number
  /**
   * Input waist position minus the cavity waist position along +z, in Rayleigh ranges z_R0 of the cavity mode:
   * positive means the input beam is still converging when it crosses the cavity waist. @default 0
   */
  waistShiftRayleigh?: number
}

export interface BeamOrderPowersOptions {
  /** Highest transverse order N = n + m returned (0 … 40). @default 10 */
  maxOrder?: number
}

/** Accepted ranges: inside them the fixed quadrature grid below is accurate to about 1e-12 per share. */
const MAX_OFFSET = 10
const MAX_TILT = 10
const MIN_WAIST_RATIO = 0.02
const MAX_WAIST_RATIO = 50
const MAX_WAIST_SHIFT = 50
const MAX_ORDER = 40
/**
 * Quadrature grid in ξ = x / w0. HG_40 falls below e^(−30) of its peak by |ξ| = 10, and the integrand's spectrum
 * decays like exp(−k² (waistRatio)² / 4) around k = 2·tilt, far inside the grid's Nyquist wavenumber π / 0.01.
 */
const GRID_HALF_WIDTH = 10
const GRID_POINTS = 2001
const GRID_STEP = (2 * GRID_HALF_WIDTH) / (GRID_POINTS - 1)

/** Normalised 1-D Hermite–Gauss functions of the cavity mode on the grid, row n; grown on demand and then reused. */
const hermiteGaussRows: Float64Array[] = []
/** For each n, the index range [from, to) outside which rows 0 … n all stay below ROW_FLOOR (the rest adds nothing). */
const rowWindows: [number, number][] = []
const ROW_FLOOR = 1e-20
/** Scratch buffers for the input field on the grid (real and imaginary part); the function is synchronous. */
const fieldRe = new Float64Array(GRID_POINTS)
const fieldIm = new Float64Array(GRID_POINTS)

/**
 * Power share per transverse order N = n + m (index N = 0 … maxOrder) of a Gaussian input beam decomposed into the
 * Hermite–Gauss modes of a round cavity mode, for a beam offset and tilted on each axis and mismatched in waist size
 * and waist position. Per axis the input field at the cavity waist, E(ξ) = exp(−i(ξ − a)²/q̃ − 2i·t·ξ) with
 * q̃ = −waistShiftRayleigh + i·waistRatio² (q in units of z_R0, phase convention exp(i(ωt − kz))), is normalised and
 * projected on u_n(ξ) = (2/π)^¼ (2ⁿ n!)^(−½) H_n(√2 ξ) e^(−ξ²) by the trapezoidal rule; the shares are
 * P_N = Σ_{n+m=N} |c_n^x|² |c_m^y|². They sum to the power captured by orders 0 … maxOrder; the rest, 1 − Σ P_N,
 * lies in higher orders. Sources: Siegman, "Lasers" (1986), ch. 16 (Hermite–Gaussian modes and their
 * orthonormality); Anderson, Appl. Opt. 23, 2944 (1984) (coupling of a misaligned beam into higher-order modes)
 * (both from memory).
 */
export function beamOrderPowers(misfit: BeamMisfit, options: BeamOrderPowersOptions = {}): number[] {
  assertMisfit(misfit)
  assertSimOption(typeof options === 'object' && options !== null, 'options must be an object')
  const { maxOrder = 10 } = options
  assertSimOption(
    Number.isInteger(maxOrder) && maxOrder >= 0 && maxOrder <= MAX_ORDER,
    `maxOrder must be an integer from 0 to ${MAX_ORDER}, got ${String(maxOrder)}`,
  )
  const { offsetX = 0, offsetY = 0, tiltX = 0, tiltY = 0, waistRatio = 1, waistShiftRayleigh = 0 } = misfit

  growHermiteGaussRows(maxOrder)
  const x = axisShares(offsetX, tiltX, waistRatio, waistShiftRayleigh, maxOrder)
  const y = offsetY === offsetX && tiltY === tiltX ? x : axisShares(offsetY, tiltY, waistRatio, waistShiftRayleigh, maxOrder)
  const shares = new Array<number>(maxOrder + 1).fill(0)
  for (let n = 0; n <= maxOrder; n++) {
    for (let m = 0; n + m <= maxOrder; m++) shares[n + m] += x[n] * y[m]
  }
  return shares
}

/**
 * A random but plausible misfit whose TEM00 share `beamOrderPowers(misfit)[0]` is `targetFundamental` (to 1e-7
 * relative; accepted 0.01 … 1): a random mix of offset, tilt, waist-size and waist-position errors with random signs
 * on both axes, all scaled by one factor found by bracketed root finding. The four kinds are weighted so that each
 * costs about the same TEM00 share per unit of the factor: for small errors P_0 ≈ 1 − Σ(a² + t²) − (ln waistRatio)²
 * − (waistShiftRayleigh / 2)² (expansion of the closed-form overlaps; Kogelnik & Li, Appl. Opt. 5, 1550 (1966)).
 */
export function drawBeamMisfit(random: SeededRandom, targetFundamental: number): BeamMisfit {
  assertSimOption(
    typeof random === 'object' && random !== null && typeof random.uniform === 'function' && typeof random.normal === 'function',
    'random must be a SeededRandom (see createRandom)',
  )
  assertSimOption(
    isNumberIn(targetFundamental, 0.01, 1),
    `targetFundamental must be a number from 0.01 to 1, got ${String(targetFundamental)}`,
  )
  if (targetFundamental === 1) return scaledMisfit([0, 0, 0, 0, 0, 0], 0)
  // Root of f(u) = ln P_0 − ln target in u = scale², nearly linear in u (exactly so for offset and tilt alone).
  const logTarget = Math.log(targetFundamental)
  const f = (direction: number[], u: number) =>
    Math.log(beamOrderPowers(scaledMisfit(direction, Math.sqrt(u)), { maxOrder: 0 })[0]) - logTarget

  for (let attempt = 0; attempt < 100; attempt++) {
    const direction = drawDirection(random)
    const uLimit = largestScale(direction) ** 2
    if (uLimit === 0) continue
    let uLow = 0
    let fLow = -logTarget
    let uHigh = Math.min(-logTarget, uLimit)
    let fHigh = f(direction, uHigh)
    while (fHigh > 0 && uHigh < uLimit) {
      uLow = uHigh
      fLow = fHigh
      uHigh = Math.min(4 * uHigh, uLimit)
      fHigh = f(direction, uHigh)
    }
    if (fHigh > 0) continue
    // Regula falsi with the Illinois modification (halve the stale end's value), which keeps the bracket shrinking;
    // the halved values only steer the next guess, so the answer is the evaluated point of smallest |f|.
    let best = uHigh
    let bestF = fHigh
    let side = 0
    for (let step = 0; step < 100 && Math.abs(bestF) > 1e-7; step++) {
      const u = uHigh - (fHigh * (uHigh - uLow)) / (fHigh - fLow)
      const fu = f(direction, u)
      if (Math.abs(fu) < Math.abs(bestF)) {
        best = u
        bestF = fu
      }
      if (fu > 0) {
        uLow = u
        fLow = fu
        if (side === -1) fHigh /= 2
        side = -1
      } else {
        uHigh = u
        fHigh = fu
        if (side === 1) fLow /= 2
        side = 1
      }
    }
    return scaledMisfit(direction, Math.sqrt(best))
  }
  // Unreachable in practice: a random direction reaches 0.01 well inside the accepted ranges.
  throw new Error('drawBeamMisfit found no misfit direction reaching the target within the accepted ranges')
}

/** Unit direction [offsetX, offsetY, tiltX, tiltY, ln waistRatio, waistShiftRayleigh / 2] with random kind weights. */
function drawDirection(random: SeededRandom): number[] {
  const offsetWeight = random.uniform()
  const tiltWeight = random.uniform()
  const sizeWeight = random.uniform()
  const shiftWeight = random.uniform()
  const direction = [
    offsetWeight * random.normal(),
    offsetWeight * random.normal(),
    tiltWeight * random.normal(),
    tiltWeight * random.normal(),
    sizeWeight * random.normal(),
    shiftWeight * random.normal(),
  ]
  const norm = Math.hypot(...direction)
  return norm === 0 ? direction : direction.map((v) => v / norm)
}

function scaledMisfit(direction: number[], scale: number): BeamMisfit {
  return {
    offsetX: scale * direction[0],
    offsetY: scale * direction[1],
    tiltX: scale * direction[2],
    tiltY: scale * direction[3],
    waistRatio: Math.exp(scale * direction[4]),
    waistShiftRayleigh: 2 * scale * direction[5],
  }
}

/** Largest scale factor that keeps every parameter of the scaled misfit inside the accepted ranges. */
function largestScale(direction: number[]): number {
  const limits = [
    MAX_OFFSET,
    MAX_OFFSET,
    MAX_TILT,
    MAX_TILT,
    direction[4] > 0 ? Math.log(MAX_WAIST_RATIO) : -Math.log(MIN_WAIST_RATIO),
    MAX_WAIST_SHIFT / 2,
  ]
  let scale = Infinity
  for (let i = 0; i < direction.length; i++) {
    if (direction[i] !== 0) scale = Math.min(scale, (0.999 * limits[i]) / Math.abs(direction[i]))
  }
  return Number.isFinite(scale) ? scale : 0
}

/** |c_n|² for n = 0 … maxOrder on one axis: offset a (w0), tilt t (θ0), q̃ = −s + i r² in units of z_R0. */
function axisShares(offset: number, tilt: number, waistRatio: number, waistShift: number, maxOrder: number): number[] {
  // b = i / q̃, so that E = exp(−b (ξ − a)² − 2i t ξ); Re b = 1 / w(z)² in w0 units.
  const r2 = waistRatio * waistRatio
  const qAbs2 = waistShift * waistShift + r2 * r2
  const bRe = r2 / qAbs2
  const bIm = -waistShift / qAbs2
  // ∫|E|² dξ = √(π / (2 Re b)): normalise analytically, so power outside the grid still counts as lost.
  const norm = Math.sqrt(Math.sqrt((2 * bRe) / Math.PI))
  const [from, to] = rowWindows[maxOrder]
  for (let i = from; i < to; i++) {
    const xi = -GRID_HALF_WIDTH + i * GRID_STEP
    const d = xi - offset
    const logAmplitude = -bRe * d * d
    // Below e^(−46) ≈ 1e-20 of the peak the field adds nothing that a share could show; skip its cos and sin.
    if (logAmplitude < -46) {
      fieldRe[i] = 0
      fieldIm[i] = 0
      continue
    }
    const amplitude = norm * Math.exp(logAmplitude)
    const phase = -bIm * d * d - 2 * tilt * xi
    fieldRe[i] = amplitude * Math.cos(phase)
    fieldIm[i] = amplitude * Math.sin(phase)
  }
  const shares = new Array<number>(maxOrder + 1)
  for (let n = 0; n <= maxOrder; n++) {
    const row = hermiteGaussRows[n]
    let re = 0
    let im = 0
    for (let i = from; i < to; i++) {
      re += row[i] * fieldRe[i]
      im += row[i] * fieldIm[i]
    }
    shares[n] = (re * re + im * im) * GRID_STEP * GRID_STEP
  }
  return shares
}

/**
 * Fills rows up to maxOrder with u_n(ξ) by the normalised three-term recurrence
 * u_{n+1} = √(2/(n+1))·√2 ξ·u_n − √(n/(n+1))·u_{n−1} (from H_{n+1}(y) = 2y H_n − 2n H_{n−1}; Siegman ch. 16).
 */
function growHermiteGaussRows(maxOrder: number): void {
  if (hermiteGaussRows.length === 0) {
    const first = new Float64Array(GRID_POINTS)
    for (let i = 0; i < GRID_POINTS; i++) {
      const xi = -GRID_HALF_WIDTH + i * GRID_STEP
      first[i] = Math.sqrt(Math.sqrt(2 / Math.PI)) * Math.exp(-xi * xi)
    }
    hermiteGaussRows.push(first)
  }
  for (let n = hermiteGaussRows.length - 1; n < maxOrder; n++) {
    const current = hermiteGaussRows[n]
    const previous = n > 0 ? hermiteGaussRows[n - 1] : null
    const next = new Float64Array(GRID_POINTS)
    const a = Math.sqrt(2 / (n + 1)) * Math.SQRT2
    const c = Math.sqrt(n / (n + 1))
    for (let i = 0; i < GRID_POINTS; i++) {
      const xi = -GRID_HALF_WIDTH + i * GRID_STEP
      next[i] = a * xi * current[i] - (previous === null ? 0 : c * previous[i])
    }
    hermiteGaussRows.push(next)
  }
  for (let n = rowWindows.length; n <= maxOrder; n++) {
    const row = hermiteGaussRows[n]
    let from = n > 0 ? rowWindows[n - 1][0] : (GRID_POINTS - 1) / 2
    while (from > 0 && Math.abs(row[from - 1]) > ROW_FLOOR) from--
    // Rows are even or odd in ξ on a grid symmetric about 0, so the window is symmetric too.
    rowWindows.push([from, GRID_POINTS - from])
  }
}

function assertMisfit(misfit: BeamMisfit): void {
  assertSimOption(typeof misfit === 'object' && misfit !== null, 'misfit must be an object such as { offsetX, tiltX, waistRatio }')
  const ranges: [keyof BeamMisfit, number, number][] = [
    ['offsetX', -MAX_OFFSET, MAX_OFFSET],
    ['offsetY', -MAX_OFFSET, MAX_OFFSET],
    ['tiltX', -MAX_TILT, MAX_TILT],
    ['tiltY', -MAX_TILT, MAX_TILT],
    ['waistRatio', MIN_WAIST_RATIO, MAX_WAIST_RATIO],
    ['waistShiftRayleigh', -MAX_WAIST_SHIFT, MAX_WAIST_SHIFT],
  ]
  for (const [name, min, max] of ranges) {
    const value = misfit[name]
    assertSimOption(value === undefined || isNumberIn(value, min, max), `${name} must be a number from ${min} to ${max}, got ${String(value)}`)
  }
}

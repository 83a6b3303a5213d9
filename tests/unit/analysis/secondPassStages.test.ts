import { describe, expect, it } from 'vitest'
import { smoothSignal } from '../../../shared/peaks/smoothSignal'
import { estimateNoise } from '../../../shared/peaks/estimateNoise'
import { estimateBaseline } from '../../../shared/peaks/estimateBaseline'
import { assignOrders } from '../../../shared/orders/assignOrders'
import { fitResonanceShape } from '../../../shared/peaks/fitResonanceShape'
import { calibrateSweep, frequencyAt } from '../../../shared/calibration/calibrateSweep'
import { calibrateWithOrders, type OrderedPoint } from '../../../shared/calibration/calibrateWithOrders'
import { fitOrderPowers, type PredictedLine } from '../../../shared/orders/fitOrderPowers'
import { orderFamilies } from '../../../shared/orders/orderFamilies'
import { findSweepInData } from '../../../shared/sweep/findSweepInData'

/** Deterministic Gaussian noise (Box–Muller on a linear congruential generator; common practice). */
function gaussian(seed: number): () => number {
  let s = seed >>> 0
  const u = () => ((s = (1664525 * s + 1013904223) >>> 0) + 0.5) / 4294967296
  return () => Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u())
}

/** Lorentzian h / (1 + (2(x − c)/w)²) (Siegman, "Lasers" (1986), ch. 2). */
const lorentzian = (x: number, c: number, h: number, w: number) => h / (1 + ((2 * (x - c)) / w) ** 2)

/** Airy transmission 1 / (1 + (2𝓕/π)² sin²(πz)) with z in FSR units (Born & Wolf, "Principles of Optics", §7.6). */
const airy = (z: number, finesse: number) => 1 / (1 + ((2 * finesse) / Math.PI) ** 2 * Math.sin(Math.PI * z) ** 2)

function standardDeviation(values: Float64Array): number {
  let mean = 0
  for (const v of values) mean += v / values.length
  let ss = 0
  for (const v of values) ss += (v - mean) ** 2
  return Math.sqrt(ss / (values.length - 1))
}

describe('smoothSignal', () => {
  it('when the window reaches past the ends then it averages over the samples it has', () => {
    const out = smoothSignal(Float64Array.from([0, 3, 6, 9, 12]), { halfWidth: 1 })
    expect(Array.from(out)).toEqual([1.5, 3, 6, 9, 10.5])
  })
  it('when a sample is NaN then it is skipped, not counted as zero', () => {
    expect(Array.from(smoothSignal(Float64Array.from([1, NaN, 3]), { halfWidth: 1 }))).toEqual([1, 2, 3])
    expect(Array.from(smoothSignal(Float64Array.from([1, NaN, 3]), { halfWidth: 0 }))).toEqual([1, 0, 3])
  })
  it('when white noise is averaged over 9 samples then its σ falls by √9 = 3', () => {
    // Variance of a mean of k independent samples is σ²/k (common practice).
    const g = gaussian(11)
    const y = Float64Array.from({ length: 40_000 }, () => g())
    const ratio = standardDeviation(smoothSignal(y, { halfWidth: 4 })) / standardDeviation(y)
    expect(ratio).toBeGreaterThan(0.95 / 3)
    expect(ratio).toBeLessThan(1.05 / 3)
  })
  it('when the half-width is not a non-negative integer then it throws invalid_argument', () => {
    expect(() => smoothSignal(new Float64Array(3), { halfWidth: 1.5 })).toThrow(expect.objectContaining({ code: 'invalid_argument' }))
    expect(() => smoothSignal(new Float64Array(3), { halfWidth: -1 })).toThrow(expect.objectContaining({ code: 'invalid_argument' }))
  })
})

describe('estimateNoise', () => {
  it('when the absolute first differences are 1, 2, 3, 4, 5 then σ = 1.4826 · 3 / √2', () => {
    // Median absolute difference 3; MAD scale 1.4826 (Hampel, J. Am. Stat. Assoc. 69, 383 (1974)); Δ of white noise has σ√2.
    const { sigmaV } = estimateNoise(Float64Array.from([0, 1, 3, 6, 10, 15]), { stride: 1 })
    expect(sigmaV).toBeCloseTo((1.4826 * 3) / Math.SQRT2, 12)
  })
})

describe('fitResonanceShape', () => {
  it('when a noiseless Lorentzian is fitted from a rough guess then centre, height and width come back to 1e-6', () => {
    const y = Float64Array.from({ length: 200 }, (_, i) => lorentzian(i, 100.3, 2, 8))
    const shape = fitResonanceShape(y, { centerIndex: 98, heightV: 1.5, fwhmSamples: 5 }, { sigmaV: 1e-3, window: [60, 140] })
    expect(shape).not.toBeNull()
    expect(shape!.centerIndex).toBeCloseTo(100.3, 6)
    expect(shape!.heightV).toBeCloseTo(2, 6)
    expect(shape!.fwhmSamples).toBeCloseTo(8, 6)
    expect(shape!.sidebandRatio).toBe(0)
  })
  it('when an Airy line of finesse 5 repeats every 50 samples then the fitted FWHM is 50 / 5 = 10 samples', () => {
    // FWHM = FSR / 𝓕 for the Airy function (Born & Wolf, "Principles of Optics", §7.6), here 2 asin(π/2𝓕)·P/π ≈ P/𝓕.
    const period = 50
    const finesse = 5
    const y = Float64Array.from({ length: 300 }, (_, i) => airy((i - 150) / period, finesse))
    const shape = fitResonanceShape(y, { centerIndex: 151, heightV: 0.9, fwhmSamples: 8 }, { sigmaV: 1e-3, periodSamples: period, window: [125, 175] })
    expect(shape!.centerIndex).toBeCloseTo(150, 5)
    expect(shape!.heightV).toBeCloseTo(1, 5)
    expect(shape!.fwhmSamples).toBeCloseTo(period / finesse, 4)
  })
  it('when unresolved sidebands of 10 % sit 6 samples either side then the carrier width is not widened by them', () => {
    // Phase-modulation sidebands at ±f_mod (Black, Am. J. Phys. 69, 79 (2001)); the same linewidth for all three.
    const y = Float64Array.from({ length: 200 }, (_, i) => lorentzian(i, 100, 1, 8) + 0.1 * (lorentzian(i, 94, 1, 8) + lorentzian(i, 106, 1, 8)))
    const shape = fitResonanceShape(y, { centerIndex: 100, heightV: 1.2, fwhmSamples: 12 }, { sigmaV: 1e-3, sidebandOffsetSamples: 6, window: [60, 140] })
    expect(shape!.fwhmSamples).toBeCloseTo(8, 5)
    expect(shape!.sidebandRatio).toBeCloseTo(0.1, 5)
    expect(shape!.heightV).toBeCloseTo(1, 5)
  })
  it('when the window holds fewer points than the fit needs then it returns null', () => {
    const y = Float64Array.from({ length: 50 }, (_, i) => lorentzian(i, 25, 1, 4))
    expect(fitResonanceShape(y, { centerIndex: 25, heightV: 1, fwhmSamples: 4 }, { sigmaV: 0.01, window: [24, 27] })).toBeNull()
  })
  it('when σ is not positive then it throws invalid_argument', () => {
    expect(() => fitResonanceShape(new Float64Array(20), { centerIndex: 10, heightV: 1, fwhmSamples: 2 }, { sigmaV: 0 })).toThrow(
      expect.objectContaining({ code: 'invalid_argument' }),
    )
  })
})

describe('calibrateWithOrders', () => {
  // Order N sits at p ± N·ψ/π FSR (Siegman, "Lasers" (1986), ch. 19).
  const psi = 0.6
  const atFrequency = (nu: number, sweep: (t: number) => number) => {
    // Invert a monotonic sweep ν(t) by bisection.
    let lo = -1
    let hi = 1
    for (let k = 0; k < 200; k++) {
      const mid = (lo + hi) / 2
      if (sweep(mid) < nu) lo = mid
      else hi = mid
    }
    return (lo + hi) / 2
  }
  const pointsOn = (sweep: (t: number) => number, gouy: number, direction: 1 | -1, periods: number[], orders: number[]): OrderedPoint[] =>
    periods.flatMap((p) => orders.map((order) => ({ tSeconds: atFrequency(p + (direction * order * gouy) / Math.PI, sweep), order, weight: 1 })))

  it('when transverse modes sit 1 % off the predicted ψ then ψ is refined to the truth within its bound', () => {
    const sweep = (t: number) => 2 * t
    const truth = 1.01 * psi
    const points = pointsOn(sweep, truth, 1, [-1, 0], [0, 1, 2]).concat(pointsOn(sweep, truth, 1, [1], [0]))
    const start = calibrateSweep(points.filter((p) => p.order === 0).map((p) => p.tSeconds), [-1, 0, 1])
    const result = calibrateWithOrders(points, start, 'up', psi, { maxGouyShiftRad: 0.03 * psi })
    expect(result.gouyRad).toBeCloseTo(truth, 9)
    expect(result.gouyAtBound).toBe(false)
    expect(frequencyAt(result.calibration, atFrequency(0.5, sweep))).toBeCloseTo(0.5, 9)
  })
  it('when the truth lies beyond the allowed shift then ψ stops at the bound and says so', () => {
    const sweep = (t: number) => 2 * t
    const points = pointsOn(sweep, 1.05 * psi, 1, [-1, 0], [0, 1, 2]).concat(pointsOn(sweep, 1.05 * psi, 1, [1], [0]))
    const start = calibrateSweep(points.filter((p) => p.order === 0).map((p) => p.tSeconds), [-1, 0, 1])
    const result = calibrateWithOrders(points, start, 'up', psi, { maxGouyShiftRad: 0.01 * psi })
    expect(result.gouyAtBound).toBe(true)
    expect(result.gouyRad).toBeCloseTo(1.01 * psi, 12)
  })
  it('when the sweep runs down in frequency then the orders are placed below each TEM00 and ψ is still found', () => {
    const sweep = (t: number) => 2 * t
    const truth = 0.99 * psi
    const points = pointsOn(sweep, truth, -1, [0, 1], [0, 1, 2]).concat(pointsOn(sweep, truth, -1, [-1], [0]))
    const start = calibrateSweep(points.filter((p) => p.order === 0).map((p) => p.tSeconds).sort((a, b) => a - b), [-1, 0, 1])
    const result = calibrateWithOrders(points, start, 'down', psi)
    expect(result.gouyRad).toBeCloseTo(truth, 9)
  })
  it('when only two TEM00 resonances exist then the transverse modes between them pin the sweep curvature', () => {
    // A quadratic piezo sweep: the two TEM00 alone give a straight line, wrong by up to 0.025 FSR mid-sweep.
    const sweep = (t: number) => t + 0.1 * t * t
    const points = pointsOn(sweep, psi, 1, [0], [0, 1, 2, 3]).concat(pointsOn(sweep, psi, 1, [1], [0]))
    const start = calibrateSweep(points.filter((p) => p.order === 0).map((p) => p.tSeconds), [0, 1])
    const tMid = atFrequency(0.5, sweep)
    expect(Math.abs(frequencyAt(start, tMid) - 0.5)).toBeGreaterThan(0.01)
    const result = calibrateWithOrders(points, start, 'up', psi, { maxGouyShiftRad: 0 })
    expect(frequencyAt(result.calibration, tMid)).toBeCloseTo(0.5, 9)
  })
  it('when one point was given the wrong order then it is dropped as an outlier and the fit is unharmed', () => {
    const sweep = (t: number) => 2 * t
    const points = pointsOn(sweep, psi, 1, [-1, 0, 1], [0, 1, 2])
    points[4] = { ...points[4], order: 3 }
    const start = calibrateSweep(points.filter((p) => p.order === 0).map((p) => p.tSeconds), [-1, 0, 1])
    const result = calibrateWithOrders(points, start, 'up', psi)
    expect(result.gouyRad).toBeCloseTo(psi, 9)
  })
  it('when fewer than three points are given then the starting map is returned unchanged', () => {
    const start = calibrateSweep([0, 1], [0, 1])
    const result = calibrateWithOrders([{ tSeconds: 0, order: 0, weight: 1 }, { tSeconds: 1, order: 0, weight: 1 }], start, 'up', psi)
    expect(result.calibration).toBe(start)
    expect(result.gouyRad).toBe(psi)
  })
})

describe('fitOrderPowers', () => {
  const finesse = 100
  const nu = Float64Array.from({ length: 4001 }, (_, i) => i / 2000)
  const lines: PredictedLine[] = [
    // Off the sample grid, so that no sample sits exactly on the edge of a line's support.
    { nu: 0.50013, order: 0, counted: true },
    { nu: 0.65017, order: 1, counted: true },
    { nu: 0.80011, order: 2, counted: true },
    { nu: 1.50013, order: 0, counted: false },
  ]
  const heights = [1, 0.1, 0.05, 0.9]
  // Each line is modelled out to ±15 linewidths (the function's default support, 0.15 FSR at 𝓕 = 100).
  const line = (x: number, centre: number) => (Math.abs(x - centre) <= 0.15 ? airy(x - centre, finesse) : 0)
  const model = (x: number) => 0.01 + lines.reduce((s, l, j) => s + heights[j] * line(x, l.nu), 0)

  it('when noiseless Airy lines sit at known places then heights, areas and the offset come back exactly', () => {
    const y = Float64Array.from(nu, model)
    const fit = fitOrderPowers(y, nu, lines, { finesse, sigmaV: 1e-3 })
    fit.lines.forEach((line, j) => {
      expect(line.heightV).toBeCloseTo(heights[j], 9)
      expect(line.areaHeightV).toBeCloseTo(heights[j], 9)
      expect(line.observed).toBe(true)
    })
    expect(fit.offsetV).toBeCloseTo(0.01, 9)
    expect(fit.reducedChiSquare).toBeLessThan(1e-6)
  })
  it('when the samples carry white noise then χ²/dof is near 1 and each height lies within 4 standard errors', () => {
    // Linear least squares: σ²(AᵀA)⁻¹ is the covariance of the estimates (Press et al., "Numerical Recipes", §15.4).
    const g = gaussian(5)
    const sigmaV = 0.01
    const y = Float64Array.from(nu, (x) => model(x) + sigmaV * g())
    const fit = fitOrderPowers(y, nu, lines, { finesse, sigmaV })
    expect(fit.reducedChiSquare).toBeGreaterThan(0.9)
    expect(fit.reducedChiSquare).toBeLessThan(1.1)
    fit.lines.forEach((line, j) => expect(Math.abs(line.heightV - heights[j])).toBeLessThan(4 * line.heightErrorV))
  })
  it('when only the windows around the lines are handed over with their ν widths then the result is unchanged', () => {
    const y = Float64Array.from(nu, model)
    const whole = fitOrderPowers(y, nu, lines, { finesse, sigmaV: 1e-3 })
    const keep = Array.from(nu.keys()).filter((i) => lines.some((l) => Math.abs(nu[i] - l.nu) <= 0.15))
    const part = fitOrderPowers(Float64Array.from(keep, (i) => y[i]), Float64Array.from(keep, (i) => nu[i]), lines, {
      finesse,
      sigmaV: 1e-3,
      stepFsr: new Float64Array(keep.length).fill(1 / 2000),
    })
    part.lines.forEach((line, j) => expect(line.areaHeightV).toBeCloseTo(whole.lines[j].areaHeightV, 9))
  })
  it('when a line lies outside the samples then it is reported unobserved with zero height', () => {
    const y = Float64Array.from(nu, model)
    const fit = fitOrderPowers(y, nu, [...lines, { nu: 5, order: 3, counted: true }], { finesse, sigmaV: 1e-3 })
    expect(fit.lines[4]).toMatchObject({ observed: false, heightV: 0, heightErrorV: Infinity })
  })
  it('when the finesse is not above 1 then it throws invalid_argument', () => {
    expect(() => fitOrderPowers(new Float64Array(3), new Float64Array(3), lines, { finesse: 1, sigmaV: 1 })).toThrow(
      expect.objectContaining({ code: 'invalid_argument' }),
    )
  })
})

describe('orderFamilies', () => {
  it('when ψ = π/4 (L = R/2) then orders N and N + 4 coincide: families 0/4/8, 1/5/9, 2/6/10, 3/7', () => {
    // N·ψ/π mod 1 repeats every 4 orders (Siegman, "Lasers" (1986), ch. 19; OPTICS-CHECKS 2(a) half-confocal).
    const families = orderFamilies(Math.PI / 4, 10, 0.005)
    expect(families.leaders).toEqual([0, 1, 2, 3])
    expect(families.leaderOf).toEqual([0, 1, 2, 3, 0, 1, 2, 3, 0, 1, 2])
  })
  it('when ψ = π/3 (g1 g2 = 1/4) then orders repeat every 3', () => {
    // ψ = arccos(√(g1 g2)) = arccos(1/2) (Siegman, "Lasers" (1986), ch. 19).
    expect(orderFamilies(Math.PI / 3, 6, 0.005).leaderOf).toEqual([0, 1, 2, 0, 1, 2, 0])
  })
  it('when ψ is generic then every order up to 10 is its own family', () => {
    // Plano-concave L = 100 mm, R = 500 mm: ψ = arccos(√0.8) = 0.4636 rad; offsets N·0.1476 mod 1 stay > 0.005 apart.
    const families = orderFamilies(Math.acos(Math.sqrt(0.8)), 10, 0.005)
    expect(families.leaders).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10])
  })
  it('when the threshold grows to 0.04 FSR then orders 0 and 7 (0.033 FSR apart) merge', () => {
    expect(orderFamilies(Math.acos(Math.sqrt(0.8)), 10, 0.04).leaderOf[7]).toBe(0)
  })
})

describe('findSweepInData', () => {
  const wide = [100, 200, 300, 400, 500].map((c) => ({ centerIndex: c, heightV: 1, fwhmSamples: 10 }))
  it('when a flyback crosses the resonances with narrower peaks then the run of wide ones is the sweep', () => {
    // Width in time = linewidth / sweep rate: a faster flyback gives narrower peaks (common practice).
    const flyback = [560, 580, 600].map((c) => ({ centerIndex: c, heightV: 0.9, fwhmSamples: 2 }))
    const sweep = findSweepInData([...wide, ...flyback], 700)
    expect(sweep.startIndex).toBe(0)
    expect(sweep.endIndex).toBe(Math.floor((500 + 560) / 2) + 1)
    expect(sweep.segmentCount).toBe(2)
  })
  it('when a flyback precedes the sweep then the part starts half-way between the two runs', () => {
    const flyback = [10, 30, 50].map((c) => ({ centerIndex: c, heightV: 1, fwhmSamples: 2 }))
    const sweep = findSweepInData([...flyback, ...wide], 600)
    expect(sweep.startIndex).toBe(Math.ceil((50 + 100) / 2))
    expect(sweep.endIndex).toBe(600)
  })
  it('when every tall peak has the same width, or there are fewer than three, then the whole record is used', () => {
    expect(findSweepInData(wide, 600)).toMatchObject({ startIndex: 0, endIndex: 600, segmentCount: 0 })
    expect(findSweepInData(wide.slice(0, 2), 600)).toMatchObject({ startIndex: 0, endIndex: 600 })
  })
})

describe('estimateBaseline drift', () => {
  it('when the dark level drifts by 20σ across the record then the baseline follows it', () => {
    const g = gaussian(21)
    const n = 16_000
    const y = Float64Array.from({ length: n }, (_, i) => 0.1 + (0.2 * i) / n + 0.01 * g())
    const { baselineV } = estimateBaseline(y, 0.01)
    expect(baselineV[500]).toBeCloseTo(0.1 + (0.2 * 500) / n, 2)
    expect(baselineV[n - 500]).toBeCloseTo(0.1 + (0.2 * (n - 500)) / n, 2)
  })
  it('when resonance wings raise some blocks by less than 4σ then one constant level is used', () => {
    // Wide Airy wings (finesse 20) fill the blocks near each line: that is light, not drift (common practice).
    const g = gaussian(22)
    const n = 16_000
    const y = Float64Array.from({ length: n }, (_, i) => 0.05 + 0.01 * g() + airy((i - 2000) / 4000, 20))
    const { baselineV, darkLevelV } = estimateBaseline(y, 0.01)
    expect(baselineV.every((v) => v === darkLevelV)).toBe(true)
    // The level comes from the side below the median; what lifts it is the light that is everywhere: the Airy
    // floor 1/(1 + (2𝓕/π)²) = 0.006 at 𝓕 = 20 (Born & Wolf, "Principles of Optics", §7.6) and the wings above it.
    expect(darkLevelV).toBeGreaterThan(0.05)
    expect(darkLevelV - 0.05).toBeLessThan(0.015)
  })
})

describe('assignOrders sidebands', () => {
  it('when a resonance sits where a sideband would be but no stronger carrier is beside it then it is a carrier', () => {
    // A sideband sits one modulation frequency from its own, stronger carrier (Black, Am. J. Phys. 69, 79 (2001)).
    const psi = 0.3 * Math.PI
    const placed = [
      { positionFsr: 0, weight: 1, fundamental: true },
      { positionFsr: 0.305, weight: 0.3, fundamental: false },
      { positionFsr: 1, weight: 1, fundamental: true },
    ]
    const result = assignOrders(placed, psi, { sidebandOffsetFsr: 0.004, toleranceFsr: 0.02, maxGouyShiftRad: 0 })
    expect(result.labels[1]).toMatchObject({ kind: 'carrier', order: 1 })
  })
})

describe('fitOrderPowers background and quick mode', () => {
  const finesse = 100
  const nu = Float64Array.from({ length: 4001 }, (_, i) => i / 2000)
  const x = Float64Array.from(nu, (v) => v - 1)
  const lines: PredictedLine[] = [
    { nu: 0.50013, order: 0, counted: true },
    { nu: 1.50013, order: 0, counted: true },
  ]
  const line = (v: number, centre: number) => (Math.abs(v - centre) <= 0.15 ? airy(v - centre, finesse) : 0)
  // A quadratic drift of the dark level under two lines.
  const y = Float64Array.from(nu, (v, i) => 0.02 + 0.01 * x[i] + 0.005 * x[i] * x[i] + line(v, 0.50013) + 0.8 * line(v, 1.50013))

  it('when the dark level drifts quadratically then a degree-2 background gives the heights back exactly', () => {
    const fit = fitOrderPowers(y, nu, lines, { finesse, sigmaV: 1e-3, background: { x, degree: 2 } })
    expect(fit.lines[0].heightV).toBeCloseTo(1, 9)
    expect(fit.lines[1].heightV).toBeCloseTo(0.8, 9)
    expect(fit.offsetV).toBeCloseTo(0.02, 9)
    // A constant alone cannot follow the drift.
    const flat = fitOrderPowers(y, nu, lines, { finesse, sigmaV: 1e-3 })
    expect(Math.abs(flat.lines[1].heightV - 0.8)).toBeGreaterThan(1e-3)
  })
  it('when only residuals are asked for then χ² matches the full fit (RSS = yᵀy − βᵀAᵀy)', () => {
    // Normal-equation identity of linear least squares (Press et al., "Numerical Recipes", §15.4).
    const g = gaussian(9)
    const noisy = Float64Array.from(y, (v) => v + 0.01 * g())
    const options = { finesse: 97, sigmaV: 0.01, background: { x, degree: 2 } }
    const full = fitOrderPowers(noisy, nu, lines, options)
    const quick = fitOrderPowers(noisy, nu, lines, { ...options, residualOnly: true })
    expect(quick.reducedChiSquare).toBeCloseTo(full.reducedChiSquare, 8)
    expect(quick.lines[0].heightV).toBeCloseTo(full.lines[0].heightV, 12)
  })
})

import { frequencyAt, sweepRateAt, type SweepCalibration } from '../../calibration/calibrateSweep'
import { median } from '../../numbers'
import type { SpectrumPeak } from '../readSpectrum'

/**
 * ν(t) = Σ cₘ uᵐ (m ≥ 1) with one free offset per chain, each chain's members one FSR apart: weighted linear least
 * squares (Press et al., "Numerical Recipes", §15.4) with the offsets eliminated by centring each chain. The degree
 * grows with the links, up to cubic (a piezo's response is close to cubic; common practice): resonance centres are
 * far more precise than a linewidth, so a polynomial through them may interpolate.
 */
export function calibrateFromChains(peaks: SpectrumPeak[], chains: number[][], period: number): SweepCalibration | null {
  const times = chains.flat().map((i) => peaks[i].tSeconds)
  if (times.length < 2) return null
  const lo = Math.min(...peaks.map((p) => p.tSeconds))
  const hi = Math.max(...peaks.map((p) => p.tSeconds))
  const t0Seconds = (lo + hi) / 2
  const scaleSeconds = Math.max((hi - lo) / 2, period / 2)
  const linkCount = chains.reduce((s, c) => s + c.length - 1, 0)
  const degree = Math.min(3, linkCount)
  const rows: { x: number[]; y: number; w: number }[] = []
  for (const chain of chains) {
    const u = chain.map((i) => (peaks[i].tSeconds - t0Seconds) / scaleSeconds)
    const w = chain.map((i) => peaks[i].heightV)
    const wSum = w.reduce((a, b) => a + b, 0)
    const meanK = chain.reduce((s, _, k) => s + w[k] * k, 0) / wSum
    const meanPow = Array.from({ length: degree }, (_, m) => chain.reduce((s, _, k) => s + w[k] * u[k] ** (m + 1), 0) / wSum)
    chain.forEach((_, k) => rows.push({ x: meanPow.map((mp, m) => u[k] ** (m + 1) - mp), y: k - meanK, w: w[k] }))
  }
  const c = weightedLeastSquares(rows, degree)
  if (!c || !(c[0] > 0)) return null
  const coefficients = [0, ...c]
  const map = { coefficients, t0Seconds, scaleSeconds }
  if (!(sweepRateAt(map, lo) > 0 && sweepRateAt(map, hi) > 0)) return null
  const spacings = chains.flatMap((ch) => ch.slice(1).map((j, k) => peaks[j].tSeconds - peaks[ch[k]].tSeconds)).sort((a, b) => a - b)
  let ss = 0
  let n = 0
  for (const chain of chains) {
    const nu = chain.map((i) => frequencyAt(map, peaks[i].tSeconds))
    const offset = nu.reduce((s, v, k) => s + v - k, 0) / nu.length
    nu.forEach((v, k) => {
      ss += (v - k - offset) ** 2
      n++
    })
  }
  return {
    coefficients,
    t0Seconds,
    scaleSeconds,
    polynomialOrder: degree,
    residualRmsFsr: Math.sqrt(ss / Math.max(n, 1)),
    fsrSeconds: median(spacings),
    meanSpacingSeconds: spacings.reduce((a, b) => a + b, 0) / spacings.length,
    spacingRangeSeconds: [spacings[0], spacings[spacings.length - 1]],
  }
}

/** ν = (t − t_mid)/period: a straight-line sweep (no resonance repeats to show its bend). */
export function straightSweep(peaks: SpectrumPeak[], period: number): SweepCalibration {
  const lo = Math.min(...peaks.map((p) => p.tSeconds))
  const hi = Math.max(...peaks.map((p) => p.tSeconds))
  const scaleSeconds = Math.max((hi - lo) / 2, period / 2)
  return {
    coefficients: [0, scaleSeconds / period],
    t0Seconds: (lo + hi) / 2,
    scaleSeconds,
    polynomialOrder: 1,
    residualRmsFsr: 0,
    fsrSeconds: period,
    meanSpacingSeconds: period,
    spacingRangeSeconds: [period, period],
  }
}

/**
 * The FSR on the time axis as the TEM00 resonances give it (median, mean and range of their spacings, as on a TEM00
 * comb); with a single TEM00, the local period of the calibration at it.
 */
export function spacingOf(times: number[], fsrIndex: number[], calibration: SweepCalibration): Pick<SweepCalibration, 'fsrSeconds' | 'meanSpacingSeconds' | 'spacingRangeSeconds'> {
  if (times.length >= 2) {
    const spacings = times.slice(1).map((t, k) => (t - times[k]) / (fsrIndex[k + 1] - fsrIndex[k])).sort((a, b) => a - b)
    return {
      fsrSeconds: median(spacings),
      meanSpacingSeconds: (times[times.length - 1] - times[0]) / (fsrIndex[fsrIndex.length - 1] - fsrIndex[0]),
      spacingRangeSeconds: [spacings[0], spacings[spacings.length - 1]],
    }
  }
  const local = 1 / sweepRateAt(calibration, times[0])
  return { fsrSeconds: local, meanSpacingSeconds: local, spacingRangeSeconds: [local, local] }
}

function weightedLeastSquares(rows: { x: number[]; y: number; w: number }[], size: number): number[] | null {
  const a = Array.from({ length: size }, () => new Array<number>(size + 1).fill(0))
  for (const r of rows) {
    for (let i = 0; i < size; i++) {
      for (let j = 0; j < size; j++) a[i][j] += r.w * r.x[i] * r.x[j]
      a[i][size] += r.w * r.x[i] * r.y
    }
  }
  // A faint ridge on the curvature terms keeps a short chain from bending the sweep wildly.
  for (let i = 1; i < size; i++) a[i][i] += 1e-6 * a[0][0]
  for (let col = 0; col < size; col++) {
    let pivot = col
    for (let r = col + 1; r < size; r++) if (Math.abs(a[r][col]) > Math.abs(a[pivot][col])) pivot = r
    ;[a[col], a[pivot]] = [a[pivot], a[col]]
    if (!(Math.abs(a[col][col]) > 0)) return null
    for (let r = 0; r < size; r++) {
      if (r === col) continue
      const f = a[r][col] / a[col][col]
      for (let c = col; c <= size; c++) a[r][c] -= f * a[col][c]
    }
  }
  return a.map((row, r) => row[size] / row[r])
}

import { fitPeakGroup, type PeakModel } from '../fit'
import type { ResonanceCandidate } from './findResonances'

/** One resonance measured on the sample axis of the selected sweep part. */
export interface MeasuredResonance {
  /** Centre, fractional sample index within the part. */
  centerIndex: number
  /** Height above the baseline, volts (fitted when the fit succeeded, else the highest sample). */
  heightV: number
  heightErrorV: number
  /** FWHM in samples (fitted, else from area/height for a Lorentzian). */
  fwhmSamples: number
  fwhmErrorSamples: number
  /** Σ (y − baseline) over the window, volt·samples, corrected for the Lorentzian wings outside the window. */
  areaVSamples: number
  areaErrorVSamples: number
  /** True when the Levenberg–Marquardt fit converged and was used for height and width. */
  fitted: boolean
  /** Reduced χ² of the fit (NaN when not fitted). */
  reducedChiSquare: number
  lobeCount: number
  /** Highest sample above the baseline, volts. */
  maxV: number
}

export interface MeasureResonancesOptions {
  /** Summation half-window in linewidths (clipped half-way to the neighbours). @default 6 */
  windowLinewidths?: number
  /** Lineshape for the fits. @default 'lorentzian' */
  model?: PeakModel
  /** Airy period (FSR) in samples, needed for model 'airy'. */
  periodSamples?: number
  /** Do not fit resonances narrower than this many samples (FWHM): height and area from the samples only. @default 2.5 */
  minFitSamples?: number
}

/**
 * Measures every resonance twice: by integrated power (area, summation over a window of fixed width in
 * linewidths, corrected for the Lorentzian wings left outside, common practice) and by a Levenberg–Marquardt
 * fit of height, centre and width (Lorentzian or Airy lineshape, Born & Wolf, "Principles of Optics", §7.6).
 * Resonances whose windows touch are fitted together.
 */
export function measureResonances(
  signalV: Float64Array,
  candidates: ResonanceCandidate[],
  sigmaV: number,
  options: MeasureResonancesOptions = {},
): MeasuredResonance[] {
  const { windowLinewidths = 6, model = 'lorentzian', periodSamples, minFitSamples = 2.5 } = options
  const n = signalV.length
  const rough = candidates.map((c) => roughWidth(signalV, c))
  const out: MeasuredResonance[] = []
  for (let k = 0; k < candidates.length; k++) {
    const c = candidates[k]
    const width = rough[k]
    const prevPeak = k > 0 ? candidates[k - 1].peakIndex : -Infinity
    const nextPeak = k + 1 < candidates.length ? candidates[k + 1].peakIndex : Infinity
    const reach = windowLinewidths * width.fwhm
    const lo = Math.max(0, Math.ceil(Math.max(c.peakIndex - reach, (prevPeak + c.peakIndex) / 2, c.startIndex - reach)))
    const hi = Math.min(n - 1, Math.floor(Math.min(c.peakIndex + reach, (nextPeak + c.peakIndex) / 2, c.endIndex - 1 + reach)))
    let sum = 0
    for (let i = lo; i <= hi; i++) sum += signalV[i]
    const captured = lorentzCaptured(width.center - (lo - 0.5), hi + 0.5 - width.center, width.fwhm)
    const areaVSamples = sum / captured
    const areaErrorVSamples = (sigmaV * Math.sqrt(hi - lo + 1)) / captured
    const base: MeasuredResonance = {
      centerIndex: width.center,
      heightV: c.maxV,
      heightErrorV: sigmaV,
      fwhmSamples: width.fwhm,
      fwhmErrorSamples: NaN,
      areaVSamples,
      areaErrorVSamples,
      fitted: false,
      reducedChiSquare: NaN,
      lobeCount: c.lobeCount,
      maxV: c.maxV,
    }
    if (c.lobeCount <= 2 && width.fwhm >= minFitSamples) {
      const fit = fitOne(signalV, c, width, sigmaV, model, periodSamples, prevPeak, nextPeak)
      if (fit) Object.assign(base, fit)
    }
    out.push(base)
  }
  return out
}

/** Width from area/height for a Lorentzian (area = π/2 · h · FWHM) and a centroid of the top of the peak. */
function roughWidth(signalV: Float64Array, c: ResonanceCandidate): { center: number; fwhm: number } {
  let sum = 0
  let moment = 0
  let weight = 0
  const half = c.maxV / 2
  for (let i = c.startIndex; i < c.endIndex; i++) {
    const v = signalV[i]
    sum += v
    if (v > half) {
      moment += (v - half) * i
      weight += v - half
    }
  }
  const center = weight > 0 ? moment / weight : c.peakIndex
  const fwhm = Math.max(1, (2 * sum) / (Math.PI * c.maxV))
  return { center, fwhm }
}

/** Fraction of a Lorentzian's area between centre − a and centre + b. */
function lorentzCaptured(a: number, b: number, fwhm: number): number {
  const f = (Math.atan((2 * Math.max(a, 0)) / fwhm) + Math.atan((2 * Math.max(b, 0)) / fwhm)) / Math.PI
  return Math.max(f, 0.05)
}

function fitOne(
  signalV: Float64Array,
  c: ResonanceCandidate,
  width: { center: number; fwhm: number },
  sigmaV: number,
  model: PeakModel,
  periodSamples: number | undefined,
  prevPeak: number,
  nextPeak: number,
): Partial<MeasuredResonance> | null {
  // Fit over ±2.5 linewidths: enough of the wings to pin the width, little of the neighbours.
  const reach = Math.max(3, 2.5 * width.fwhm)
  const lo = Math.max(0, Math.ceil(Math.max(width.center - reach, (prevPeak + c.peakIndex) / 2)))
  const hi = Math.min(signalV.length - 1, Math.floor(Math.min(width.center + reach, (nextPeak + c.peakIndex) / 2)))
  const count = hi - lo + 1
  if (count < 5) return null
  // Fit on a decimated copy when a resonance spans very many samples (speed; 400 points pin 3 parameters).
  const step = Math.max(1, Math.floor(count / 400))
  const x: number[] = []
  const y: number[] = []
  for (let i = lo; i <= hi; i += step) {
    let s = 0
    let m = 0
    for (let j = i; j < Math.min(i + step, hi + 1); j++) { s += signalV[j]; m++ }
    x.push(i + (m - 1) / 2)
    y.push(s / m)
  }
  try {
    const result = fitPeakGroup(x, y, [{ center: width.center, height: c.maxV, fwhm: width.fwhm }], {
      model,
      period: model === 'airy' ? periodSamples : undefined,
      noiseSigma: sigmaV / Math.sqrt(step),
      fixedBaseline: 0,
    })
    const p = result.peaks[0]
    const sane =
      result.converged &&
      Number.isFinite(p.height) && p.height > 0 &&
      Number.isFinite(p.fwhm) && p.fwhm > 0 && p.fwhm < 4 * width.fwhm + 4 &&
      Math.abs(p.center - width.center) < 2 * width.fwhm + 2
    if (!sane) return null
    return {
      centerIndex: p.center,
      heightV: p.height,
      heightErrorV: p.errors.height,
      fwhmSamples: p.fwhm,
      fwhmErrorSamples: p.errors.fwhm,
      fitted: true,
      reducedChiSquare: result.reducedChiSquare,
    }
  } catch {
    // A failed fit leaves the sample-based height and width in place (reported as not fitted).
    return null
  }
}

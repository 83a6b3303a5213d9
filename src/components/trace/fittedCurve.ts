import type { AnalysisPeak } from '../../../shared/analysis/types'

/** Beyond this many half-widths a Lorentzian is below 1e-6 of its height: skip it there. */
const CUTOFF_HALF_WIDTHS = 1000

/**
 * The analysis's model of the trace at times `tSeconds`: the dark level plus one Lorentzian per fitted
 * resonance, h / (1 + (2 (t − t0) / FWHM)²). Near each resonance the Airy transmission of a high-finesse
 * cavity is this Lorentzian (Siegman, "Lasers" (1986), §11.3).
 */
export function fittedCurve(tSeconds: ArrayLike<number>, peaks: readonly Pick<AnalysisPeak, 't' | 'height' | 'fwhmSeconds'>[], darkLevelV: number): Float64Array {
  const out = new Float64Array(tSeconds.length).fill(darkLevelV)
  for (const peak of peaks) {
    const halfWidth = peak.fwhmSeconds / 2
    if (!(halfWidth > 0) || !Number.isFinite(peak.height)) continue
    const reach = CUTOFF_HALF_WIDTHS * halfWidth
    for (let i = 0; i < tSeconds.length; i++) {
      const u = (tSeconds[i] - peak.t) / halfWidth
      if (Math.abs(u) * halfWidth > reach) continue
      out[i] += peak.height / (1 + u * u)
    }
  }
  return out
}

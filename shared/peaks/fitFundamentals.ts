import { sweepRateAt, type SweepCalibration } from '../calibration/calibrateSweep'
import { median } from '../numbers'
import { fitResonanceShape } from './fitResonanceShape'
import type { MeasuredResonance } from './measureResonances'

export interface FundamentalShape {
  member: number
  centerIndex: number
  heightV: number
  fwhmSamples: number
  fwhmErrorSamples: number
  sidebandRatio: number
  /** Linewidth in FSR units through the local sweep rate. */
  linewidthFsr: number
}

/** Fits every TEM00 resonance (with its modulation sidebands when given) for width and height. */
export function fitFundamentals(
  signal: Float64Array,
  measured: MeasuredResonance[],
  members: number[],
  calibration: SweepCalibration,
  sidebandOffsetFsr: number | null,
  sigmaV: number,
  dt: number,
  tOf: (m: MeasuredResonance) => number,
  periodSamples: number | null,
): FundamentalShape[] {
  const out: FundamentalShape[] = []
  for (const k of members) {
    const m = measured[k]
    const rate = Math.abs(sweepRateAt(calibration, tOf(m))) * dt
    if (!(rate > 0)) continue
    // Sidebands inside the window are part of the fit; carry them only when they sit within reach of the line.
    const d = sidebandOffsetFsr !== null ? sidebandOffsetFsr / rate : null
    const useSidebands = d !== null && d < 6 * m.fwhmSamples + 4
    const reach = 3 * m.fwhmSamples + (useSidebands ? d! : 0) + 2
    let lo = Math.ceil(m.centerIndex - reach)
    let hi = Math.floor(m.centerIndex + reach)
    for (let j = 0; j < measured.length; j++) {
      if (j === k) continue
      const gap = measured[j].centerIndex - m.centerIndex
      if (useSidebands && Math.abs(Math.abs(gap) - d!) < 1.5 * m.fwhmSamples + 1) continue
      if (gap > 0) hi = Math.min(hi, Math.floor(m.centerIndex + gap / 2))
      else lo = Math.max(lo, Math.ceil(m.centerIndex + gap / 2))
    }
    const shape = fitResonanceShape(
      signal,
      { centerIndex: m.centerIndex, heightV: m.heightV, fwhmSamples: m.fwhmSamples },
      { window: [lo, hi], sidebandOffsetSamples: useSidebands ? d : null, periodSamples, sigmaV },
    )
    if (!shape) continue
    out.push({
      member: k,
      centerIndex: shape.centerIndex,
      heightV: shape.heightV,
      fwhmSamples: shape.fwhmSamples,
      fwhmErrorSamples: shape.fwhmErrorSamples,
      sidebandRatio: shape.sidebandRatio,
      linewidthFsr: shape.fwhmSamples * rate,
    })
  }
  return out
}

/** Finesse = FSR / FWHM (common practice), the median over the TEM00 resonances. */
export function finesseFrom(shapes: FundamentalShape[]): { value: number; error: number | null } | null {
  if (shapes.length === 0) return null
  const values = shapes.map((s) => 1 / s.linewidthFsr)
  const value = median(values)
  const spread = values.length > 2 ? (1.4826 * median(values.map((v) => Math.abs(v - value)))) / Math.sqrt(values.length) : null
  return { value, error: spread }
}

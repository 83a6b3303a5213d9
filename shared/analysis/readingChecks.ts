import { transverseOffsetFsr } from '../cavity'
import type { AnalysisPeak } from './types'

/**
 * Two checks of a reading that need nothing but its own peaks and phase (issue 12, "honest doubt"):
 * - the families it names keep their height ratios from one FSR period to the next;
 * - TEM00 stands clear of the strong low orders, so the line model can tell their powers apart.
 */

/** A family's height change between its first and last period differs from TEM00's by more than this factor … */
const FAMILY_RATIO_DISAGREES = 1.25
/** … and by this many standard errors (5σ, common practice). */
const FAMILY_SIGMAS = 5
/** Only resonances this many σ above the noise compare (their height ratio is then good to a few per cent). */
const FAMILY_MIN_SNR = 10
/** Resonances compare only when their widths agree within this factor (crossed at the same sweep speed). */
const SAME_WIDTH = 1.5

export interface FamilyDisagreement {
  /** TEM00's height ratio, last period over first. */
  fundamentalRatio: number
  /** The transverse orders whose ratio disagrees with TEM00's, with their ratios. */
  orders: { order: number; ratio: number }[]
  /** Transverse orders that could be compared at all. */
  compared: number
}

/**
 * The lines of one cavity mode all scale alike with the laser power and the coupling, so from one FSR period to the
 * next every family of a right reading changes height by the same factor as TEM00 (Siegman, "Lasers" (1986), ch. 19:
 * each transverse mode resonates once per FSR). When two or more transverse families, and most of those that can be
 * compared, change height differently from TEM00, the resonances taken as one family are not one mode: the period
 * (and with it the TEM00 family) is likely misread. Heights compare only on well-sampled lines without fast
 * structure; the caller checks that.
 */
export function familiesDisagree(peaks: AnalysisPeak[], sigmaV: number): FamilyDisagreement | null {
  const ratios = new Map<number, { logRatio: number; error: number }>()
  const byOrder = new Map<number, AnalysisPeak[]>()
  for (const p of peaks) {
    if (p.kind !== 'carrier' || p.order === null) continue
    const members = byOrder.get(p.order)
    if (members) members.push(p)
    else byOrder.set(p.order, [p])
  }
  for (const [order, members] of byOrder) {
    if (members.length < 2) continue
    const first = members.reduce((a, b) => (b.t < a.t ? b : a))
    const last = members.reduce((a, b) => (b.t > a.t ? b : a))
    if (last.fwhmSeconds > SAME_WIDTH * first.fwhmSeconds || first.fwhmSeconds > SAME_WIDTH * last.fwhmSeconds) continue
    if (first.height < FAMILY_MIN_SNR * sigmaV || last.height < FAMILY_MIN_SNR * sigmaV) continue
    ratios.set(order, { logRatio: Math.log(last.height / first.height), error: Math.hypot(sigmaV / first.height, sigmaV / last.height) })
  }
  const tem00 = ratios.get(0)
  if (!tem00) return null
  const others = [...ratios].filter(([order]) => order > 0)
  const disagreeing = others.filter(([, r]) => {
    const d = Math.abs(r.logRatio - tem00.logRatio)
    return d > Math.log(FAMILY_RATIO_DISAGREES) && d > FAMILY_SIGMAS * Math.hypot(r.error, tem00.error)
  })
  if (disagreeing.length < 2 || 2 * disagreeing.length < others.length) return null
  return { fundamentalRatio: Math.exp(tem00.logRatio), orders: disagreeing.map(([order, r]) => ({ order, ratio: Math.exp(r.logRatio) })), compared: others.length }
}

/** A strong low order this close to TEM00 (in linewidths) merges with it: the line model cannot split their powers. */
const MERGED_LINEWIDTHS = 2
/** The low orders that carry power enough to move the TEM00 fraction by points when merged with it. */
const STRONG_ORDERS = [1, 2]

/**
 * The strong low order (1 or 2) closest to TEM00, when it stands within MERGED_LINEWIDTHS linewidths of it on the
 * optical axis (order N sits N·ψ/π FSR from TEM00, folded into one FSR; Siegman, "Lasers" (1986), ch. 19). The
 * linewidth is the larger of the measured one and the record's resolution (three samples).
 */
export function lowOrderMergedWithTem00(gouyOneWayRad: number, linewidthFsr: number): { order: number; linewidths: number } | null {
  if (!(linewidthFsr > 0) || !(gouyOneWayRad > 0)) return null
  let closest: { order: number; linewidths: number } | null = null
  for (const order of STRONG_ORDERS) {
    const d = transverseOffsetFsr(order, gouyOneWayRad)
    const linewidths = Math.min(d, 1 - d) / linewidthFsr
    if (linewidths < MERGED_LINEWIDTHS && (!closest || linewidths < closest.linewidths)) closest = { order, linewidths }
  }
  return closest
}

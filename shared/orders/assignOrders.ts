import { frac, signedCircular } from '../numbers'
import { predictOrderOffsets } from './predictOrderOffsets'

/** A resonance placed on the optical-frequency axis. */
export interface PlacedPeak {
  /** Optical frequency in FSR units relative to the TEM00 comb (any real number; only the fraction matters). */
  positionFsr: number
  /** Weight for the choice of direction and the Gouy refinement (e.g. its height). */
  weight: number
  /** True for members of the TEM00 comb (always order 0). */
  fundamental: boolean
}

export interface OrderLabel {
  kind: 'carrier' | 'sideband' | 'unassigned'
  /** Transverse order of a carrier (of a sideband: of its carrier); null when unassigned. */
  order: number | null
  /** Signed distance to the matched position, FSR units (NaN when unassigned). */
  residualFsr: number
}

export interface AssignOrdersOptions {
  /** Highest transverse order considered. @default 10 */
  maxOrder?: number
  /** Matching tolerance, FSR units. @default 0.02 */
  toleranceFsr?: number
  /** Modulation frequency over FSR (sidebands at ±this, mod 1, beside carriers); null for none. @default null */
  sidebandOffsetFsr?: number | null
  /** Orders whose sidebands are looked for. @default 2 */
  sidebandMaxOrder?: number
  /** Largest allowed refinement of ψ, rad (a 1 % length error moves ψ by far less). @default 0.08 */
  maxGouyShiftRad?: number
  /**
   * Orders that may be assigned (e.g. the lowest member of each degenerate family only). @default 0 … maxOrder
   */
  allowedOrders?: number[]
  /** Sweep directions tried (one to impose a direction decided elsewhere). @default ['up', 'down'] */
  directions?: ('up' | 'down')[]
}

export interface OrderAssignment {
  labels: OrderLabel[]
  /** 'up': optical frequency increases with time; 'down': decreases. */
  direction: 'up' | 'down'
  /** ψ refined from the matched positions (equals the prediction when nothing constrains it). */
  measuredGouyRad: number
  /** Weighted RMS residual of the carrier matches, FSR units. */
  residualRmsFsr: number
  /** What decided the direction, in one sentence. */
  directionEvidence: string
  /**
   * True when the transverse resonances' positions decide the direction (the mirrored pattern matches clearly
   * less); false when nothing was matched or both directions match about equally.
   */
  directionSettled: boolean
}

/**
 * Labels every resonance with the nearest predicted transverse order N·ψ/π mod 1 (Siegman, "Lasers" (1986),
 * ch. 19), or a modulation sideband at ±f_mod/FSR beside a carrier, or `unassigned` beyond the tolerance.
 * Both sweep directions (position x and 1 − x) are tried and the one matching more weight is kept; ψ is then
 * refined by weighted least squares on the matched carriers: δψ/π = Σ wNr / Σ wN².
 */
export function assignOrders(peaks: PlacedPeak[], predictedGouyRad: number, options: AssignOrdersOptions = {}): OrderAssignment {
  const {
    maxOrder = 10,
    toleranceFsr = 0.02,
    sidebandOffsetFsr = null,
    sidebandMaxOrder = 2,
    maxGouyShiftRad = 0.08,
    allowedOrders,
    directions = ['up', 'down'],
  } = options
  const orders = allowedOrders ?? Array.from({ length: maxOrder + 1 }, (_, k) => k)
  let best: (Omit<OrderAssignment, 'directionEvidence' | 'directionSettled'> & { score: number; positionScore: number }) | null = null
  const positionScores: number[] = []
  for (const direction of directions) {
    const positions = peaks.map((p) => (direction === 'up' ? frac(p.positionFsr) : frac(-p.positionFsr)))
    let gouy = predictedGouyRad
    let labels: OrderLabel[]
    for (const tolerance of [1.5 * toleranceFsr, 1.2 * toleranceFsr, toleranceFsr, toleranceFsr]) {
      labels = matchAll(peaks, positions, gouy, { maxOrder, orders, tolerance, sidebandOffsetFsr, sidebandMaxOrder })
      gouy = refineGouy(peaks, labels, gouy, predictedGouyRad, maxGouyShiftRad)
    }
    labels = matchAll(peaks, positions, gouy, { maxOrder, orders, tolerance: toleranceFsr, sidebandOffsetFsr, sidebandMaxOrder })
    let score = 0
    let positionScore = 0
    let ss = 0
    let ws = 0
    for (let i = 0; i < peaks.length; i++) {
      const l = labels[i]
      if (l.kind === 'unassigned' || peaks[i].fundamental) continue
      // Sidebands sit symmetrically about their carrier: they say nothing about the direction.
      if (l.kind === 'carrier') {
        positionScore += peaks[i].weight * (1 - Math.abs(l.residualFsr) / (2 * toleranceFsr))
        // A mirrored spectrum also fits with ψ → π − ψ and high orders: prefer low orders and a small ψ change.
        score += (peaks[i].weight * (1 - Math.abs(l.residualFsr) / (2 * toleranceFsr))) / (1 + 0.1 * (l.order ?? 0))
      }
      ss += peaks[i].weight * l.residualFsr ** 2
      ws += peaks[i].weight
    }
    // (Scaled no finer than 0.5 % of ψ: under a tight bound the small shift left says nothing about direction.)
    if (maxGouyShiftRad > 0) score *= Math.exp(-(((gouy - predictedGouyRad) / Math.max(0.5 * maxGouyShiftRad, 0.005 * predictedGouyRad)) ** 2))
    positionScores.push(positionScore)
    const candidate = { labels, direction, measuredGouyRad: gouy, residualRmsFsr: ws > 0 ? Math.sqrt(ss / ws) : 0, score, positionScore }
    if (!best || candidate.score > best.score) best = candidate
  }
  const { labels, direction, measuredGouyRad, residualRmsFsr, positionScore } = best!
  const other = directions.length > 1 ? Math.min(...positionScores.filter((_, k) => directions[k] !== direction)) : 0
  const meaning = direction === 'up' ? 'optical frequency rises with time' : 'optical frequency falls with time'
  let directionEvidence: string
  if (directions.length === 1) {
    directionEvidence = `${direction} (${meaning}) was given.`
  } else if (positionScore === 0 && other === 0) {
    directionEvidence = `No transverse resonance was matched in either direction: ${direction} (${meaning}) is a default, not a finding.`
  } else if (positionScore > 1.1 * other) {
    directionEvidence = `The transverse resonances sit at their predicted places for ${direction} (${meaning}); the mirrored pattern matches ${positionScore > 0 ? Math.round((100 * other) / positionScore) : 0} % as much resonance height.`
  } else {
    directionEvidence = `The transverse resonances fit both directions about equally by position (a Gouy phase near a simple fraction of π makes the pattern nearly symmetric); ${direction} (${meaning}) was chosen because it gives the stronger resonances the lower orders, which carry more power in a reasonably matched cavity, and keeps the Gouy phase nearer the prediction.`
  }
  const directionSettled = directions.length > 1 && positionScore > 1.1 * other
  return { labels, direction, measuredGouyRad, residualRmsFsr, directionEvidence, directionSettled }
}

interface MatchSettings {
  maxOrder: number
  orders: number[]
  tolerance: number
  sidebandOffsetFsr: number | null
  sidebandMaxOrder: number
}

function matchAll(peaks: PlacedPeak[], positions: number[], gouy: number, s: MatchSettings): OrderLabel[] {
  const labels = matchEach(peaks, positions, gouy, s)
  return s.sidebandOffsetFsr === null ? labels : confirmSidebands(peaks, positions, labels, gouy, s)
}

/**
 * A sideband comes with its carrier: a stronger resonance of the same order one modulation frequency away
 * in the same FSR period (Black, Am. J. Phys. 69, 79 (2001)). A resonance labelled a sideband without one is a carrier displaced by the
 * sweep's nonlinearity: it takes its carrier label when one is within the tolerance, else it stays unassigned.
 */
function confirmSidebands(peaks: PlacedPeak[], positions: number[], labels: OrderLabel[], gouy: number, s: MatchSettings): OrderLabel[] {
  const offset = s.sidebandOffsetFsr!
  const carrierOnly = { ...s, sidebandOffsetFsr: null }
  let first = Infinity
  let last = -Infinity
  for (const peak of peaks) {
    if (peak.positionFsr < first) first = peak.positionFsr
    if (peak.positionFsr > last) last = peak.positionFsr
  }
  return labels.map((label, i) => {
    if (label.kind !== 'sideband') return label
    // At the ends of the record the carrier may lie outside it: nothing to check against.
    const p = peaks[i].positionFsr
    if (p - offset < first || p + offset > last) return label
    // The carrier sits one offset to either side, displaced like the sideband (they are close): a tight match.
    const hasCarrier = peaks.some(
      (peak, j) =>
        j !== i &&
        peak.weight > peaks[i].weight &&
        [1, -1].some((sign) => Math.abs(peak.positionFsr - (peaks[i].positionFsr + sign * offset)) <= Math.min(s.tolerance, 0.5 * offset)),
    )
    if (hasCarrier) return label
    return matchEach([peaks[i]], [positions[i]], gouy, carrierOnly)[0]
  })
}

function matchEach(peaks: PlacedPeak[], positions: number[], gouy: number, s: MatchSettings): OrderLabel[] {
  const offsets = predictOrderOffsets(gouy, s.maxOrder)
  return peaks.map((peak, i) => {
    if (peak.fundamental) return { kind: 'carrier', order: 0, residualFsr: signedCircular(positions[i] - 0) }
    let bestCost = Infinity
    let label: OrderLabel = { kind: 'unassigned', order: null, residualFsr: NaN }
    for (const order of s.orders) {
      if (order > s.maxOrder) continue
      const r = signedCircular(positions[i] - offsets[order])
      // Lower orders win near-ties: they carry more power in practice (common practice).
      const cost = Math.abs(r) + order * 0.1 * s.tolerance
      if (Math.abs(r) <= s.tolerance && cost < bestCost) {
        bestCost = cost
        label = { kind: 'carrier', order, residualFsr: r }
      }
    }
    if (s.sidebandOffsetFsr !== null) {
      for (const order of s.orders) {
        if (order > Math.min(s.sidebandMaxOrder, s.maxOrder)) continue
        for (const sign of [1, -1]) {
          const r = signedCircular(positions[i] - offsets[order] - sign * s.sidebandOffsetFsr)
          // Sidebands of low orders are stronger than the high-order carriers they may sit beside.
          const cost = Math.abs(r) + (0.05 + 0.1 * order) * s.tolerance
          if (Math.abs(r) <= s.tolerance && cost < bestCost) {
            bestCost = cost
            label = { kind: 'sideband', order, residualFsr: r }
          }
        }
      }
    }
    return label
  })
}

function refineGouy(peaks: PlacedPeak[], labels: OrderLabel[], gouy: number, predicted: number, maxShift: number): number {
  let num = 0
  let den = 0
  for (let i = 0; i < peaks.length; i++) {
    const l = labels[i]
    if (l.kind !== 'carrier' || !l.order || peaks[i].fundamental) continue
    num += peaks[i].weight * l.order * l.residualFsr
    den += peaks[i].weight * l.order * l.order
  }
  if (den === 0) return gouy
  const next = gouy + Math.PI * (num / den)
  return Math.min(predicted + maxShift, Math.max(predicted - maxShift, next))
}

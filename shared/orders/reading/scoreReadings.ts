import { frequencyAt, type SweepCalibration } from '../../calibration/calibrateSweep'
import { frac, signedCircular } from '../../numbers'
import type { Family } from './spectrumFamilies'

export interface Hypothesis {
  fundamental: number
  direction: 1 | -1
  gouyRad: number
  cost: number
  orders: (number | null)[]
}

interface HypothesisSettings {
  predicted: number
  priorWidth: number
  maxOrder: number
  linewidthFsr: number
  tallest: number
  sigmaV: number
  sidebandOffsetFsr: number | null
  directions: ('up' | 'down')[]
}

/**
 * Largest share of the power a Gaussian input beam puts into order N (index N ≥ 1), with a margin: over 200,000
 * random offsets, tilts and waist errors the Hermite–Gauss decomposition of shared/sim/beamOrderPowers gave at most
 * 0.44, 0.34, 0.30, 0.27 and 0.26 for orders 1–5 (computed here, not a published figure).
 */
const MAX_ORDER_SHARE = [1, 0.5, 0.4, 0.36, 0.33, 0.32]

/** Weight of the plausibility prior (see plausibilityCost), in units of the tallest family's height. */
const PLAUSIBILITY_WEIGHT = 0.1

/**
 * Every (TEM00 family, direction, ψ) worth scoring: ψ from each family placed as order 1 … 4 of each candidate TEM00
 * (ψ = π (±Δφ + m)/N), and the prediction itself. Cost: the height of families no order explains (twice, in units of
 * the tallest), a small price per order step used (higher orders can explain anything), and the Gouy prior.
 */
export function hypotheses(families: Family[], s: HypothesisSettings): Hypothesis[] {
  const { predicted, priorWidth, maxOrder, linewidthFsr, tallest, sigmaV } = s
  const tolerance = Math.max(0.01, 3 * linewidthFsr)
  const visible = families.filter((f) => f.heightV >= 5 * sigmaV && !f.orphan && f.satelliteOf < 0).slice(0, 12)
  const candidates = visible.filter((f) => f.heightV >= 0.03 * tallest).slice(0, 8)
  const out: Hypothesis[] = []
  for (const base of candidates) {
    const b = families.indexOf(base)
    for (const direction of s.directions.map((d) => (d === 'up' ? 1 : -1) as 1 | -1)) {
      const psis = new Set<number>([predicted])
      for (const f of visible) {
        if (f === base) continue
        const d = direction * (f.phase - base.phase)
        for (let n = 1; n <= 4; n++) {
          for (let m = 0; m < n; m++) {
            const psi = (Math.PI * (frac(d) + m)) / n
            if (psi > 0.02 && psi < Math.PI - 0.02) psis.add(psi)
          }
        }
      }
      for (const psi0 of psis) {
        let psi = psi0
        let scored = scoreHypothesis(families, b, direction, psi, maxOrder, tolerance, s.sidebandOffsetFsr)
        // Refine ψ by weighted least squares on the families explained (δψ/π = Σ w N r / Σ w N²).
        for (let round = 0; round < 2; round++) {
          const refined = psi + Math.PI * scored.shift
          if (!(refined > 0 && refined < Math.PI)) break
          psi = refined
          scored = scoreHypothesis(families, b, direction, psi, maxOrder, tolerance, s.sidebandOffsetFsr)
        }
        const prior = ((psi / predicted - 1) / priorWidth) ** 2
        const cost = scored.cost / tallest + 0.02 * prior + PLAUSIBILITY_WEIGHT * plausibilityCost(families, scored.orders, tallest)
        out.push({ fundamental: b, direction, gouyRad: psi, cost, orders: scored.orders })
      }
    }
  }
  out.sort((a, b) => a.cost - b.cost)
  return out.slice(0, 12)
}

/**
 * How unlikely the order powers of a reading are for a real beam: the summed rise of the family heights from each
 * order to the next (in units of the tallest). Misalignment spreads power over orders like a Poisson distribution
 * and mismatch puts less in each higher even order (Anderson, Appl. Opt. 23, 2944 (1984); from memory), so a reading
 * whose power climbs towards its highest order — the mirror image of a real spectrum — pays for it.
 */
function plausibilityCost(families: Family[], orders: (number | null)[], tallest: number): number {
  const height: number[] = []
  orders.forEach((o, k) => {
    if (o !== null && o >= 0) height[o] = Math.max(height[o] ?? 0, families[k].heightV)
  })
  let rise = 0
  for (let n = 1; n < height.length; n++) rise += Math.max(0, (height[n] ?? 0) - (height[n - 1] ?? 0))
  // A Gaussian beam cannot put most of its power into one higher order: what a reading's shares exceed the bound by
  // counts in full (heights stand for powers: every order's line has the same area per FSR).
  const total = height.reduce((sum, h) => sum + (h ?? 0), 0)
  let excess = 0
  for (let n = 1; n < height.length; n++) excess += Math.max(0, (height[n] ?? 0) / total - (MAX_ORDER_SHARE[n] ?? MAX_ORDER_SHARE[MAX_ORDER_SHARE.length - 1]))
  // One order is one mode, resonating once per FSR with one height (drift aside): several families read as the same
  // order must have about the same height. What a second family lacks beyond a factor 1.5 counts, five times over.
  let scatter = 0
  orders.forEach((o, k) => {
    if (o !== null && o >= 0 && families[k].heightV < height[o] / 1.5) scatter += height[o] / 1.5 - families[k].heightV
  })
  return (rise + 5 * scatter) / tallest + excess / PLAUSIBILITY_WEIGHT
}

function scoreHypothesis(families: Family[], base: number, direction: 1 | -1, psi: number, maxOrder: number, tolerance: number, sidebandOffsetFsr: number | null): { cost: number; orders: (number | null)[]; shift: number } {
  const orders: (number | null)[] = families.map(() => null)
  orders[base] = 0
  let cost = 0
  let num = 0
  let den = 0
  const origin = families[base].phase
  families.forEach((f, k) => {
    if (k === base) return
    if (f.orphan) {
      // The same for every reading of this period; it weighs periods against each other.
      cost += f.heightV
      return
    }
    if (f.satelliteOf >= 0) return
    const d = direction * (f.phase - origin)
    let best: number | null = null
    let residual = 0
    for (let n = 1; n <= maxOrder; n++) {
      const r = signedCircular(d - (n * psi) / Math.PI)
      if (Math.abs(r) <= tolerance) {
        best = n
        residual = r
        break
      }
    }
    orders[k] = best
    if (best === null && sidebandOffsetFsr !== null && isSideband(d, psi, maxOrder, tolerance, sidebandOffsetFsr) && hasTallerCarrier(families, f, sidebandOffsetFsr, tolerance)) {
      // A modulation sideband of a low order: explained, but no order of its own (−1 marks it).
      orders[k] = -1
    } else if (best === null) {
      cost += 2 * f.heightV
    } else {
      cost += f.heightV * (0.01 * best + (residual / tolerance) ** 2 * 0.05)
      num += f.heightV * best * residual
      den += f.heightV * best * best
    }
  })
  return { cost, orders, shift: den > 0 ? num / den : 0 }
}

/**
 * Every order a reading uses must show at each of its predicted places inside the sweep (an order resonates once
 * per FSR): each place without a resonance costs the order's height, in units of the tallest. A wrong period or a
 * TEM00 ladder read as a comb predicts lines where there are none.
 */
export function missingLineCost(
  families: Family[],
  h: Hypothesis,
  nu: number[],
  calibration: SweepCalibration,
  span: { startSeconds: number; endSeconds: number; tallest: number; sigmaV: number; linewidthFsr: number; marginFsr: number },
): number {
  const origin = families[h.fundamental].phase
  const at = (t: number) => frequencyAt(calibration, t) - origin
  const margin = span.marginFsr
  const placed = nu.map((v) => v - origin).sort((a, b) => a - b)
  // Only where the sweep is calibrated (between the resonances seen, half an FSR beyond): past that it is extrapolated.
  const lo = Math.max(at(span.startSeconds) + margin, placed[0] - 0.5)
  const hi = Math.min(at(span.endSeconds) - margin, placed[placed.length - 1] + 0.5)
  const tolerance = Math.max(0.015, 4 * span.linewidthFsr, 3 * calibration.residualRmsFsr)
  const heights = new Map<number, number>()
  h.orders.forEach((o, k) => {
    if (o !== null && o >= 0) heights.set(o, Math.max(heights.get(o) ?? 0, families[k].heightV))
  })
  // Lines near the detection limit may be missed by the search: only families well above it must show every time,
  // and an order's missing lines never cost more than leaving its family unexplained would.
  const weakest = Math.min(...families.map((f) => f.heightV))
  let cost = 0
  for (const [order, height] of heights) {
    if (height < Math.max(15 * span.sigmaV, 3 * weakest)) continue
    const offset = (h.direction * order * h.gouyRad) / Math.PI
    let missing = 0
    for (let k = Math.ceil(lo - offset); k + offset <= hi; k++) {
      const x = k + offset
      if (!placed.some((v) => Math.abs(v - x) <= tolerance)) missing += height / span.tallest
    }
    cost += Math.min(missing, (1.5 * height) / span.tallest)
  }
  return cost
}

/** A sideband is weaker than its carrier, which sits one modulation frequency away (Black, Am. J. Phys. 69, 79 (2001)). */
function hasTallerCarrier(families: Family[], f: Family, offset: number, tolerance: number): boolean {
  return families.some((g) => g !== f && g.heightV > f.heightV && [1, -1].some((sign) => Math.abs(signedCircular(g.phase - f.phase - sign * offset)) <= tolerance))
}

function isSideband(d: number, psi: number, maxOrder: number, tolerance: number, offset: number): boolean {
  for (let n = 0; n <= Math.min(maxOrder, 2); n++) {
    for (const sign of [1, -1]) if (Math.abs(signedCircular(d - (n * psi) / Math.PI - sign * offset)) <= tolerance) return true
  }
  return false
}

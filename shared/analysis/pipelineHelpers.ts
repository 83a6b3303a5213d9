import { EngineError, type EngineWarning } from '../errors'
import { fmt, frac } from '../numbers'
import type { OrderLabel } from '../orders/assignOrders'

/** Orders measured at their predicted places: the low ones always, higher ones when a resonance was matched to them. */
export function measuredOrders(leaders: number[], labels: OrderLabel[], always: number): number[] {
  const seen = new Set(labels.filter((l) => l.kind === 'carrier' && l.order !== null).map((l) => l.order!))
  return leaders.filter((order) => order <= always || seen.has(order))
}

/** Summed height of the resonances a labelling gives a transverse order (1 and up), volts. */
export function transverseHeight(labels: OrderLabel[], measured: { heightV: number }[]): number {
  let sum = 0
  for (let i = 0; i < labels.length; i++) if (labels[i].kind === 'carrier' && (labels[i].order ?? 0) > 0) sum += measured[i].heightV
  return sum
}

/** The line model's shares, or null when it finds no TEM00 power to measure (other errors propagate). */
export function measureOrSkip<T>(measure: () => T): T | null {
  try {
    return measure()
  } catch (error) {
    if (error instanceof EngineError && error.code === 'no_resonances') return null
    throw error
  }
}

export function orientedFraction(positionFsr: number, direction: 'up' | 'down' | 'unknown'): number {
  return direction === 'down' ? frac(-positionFsr) : frac(positionFsr)
}

/** The warnings the pipeline words itself: a ringing detector, split orders, and two resonances that may be a ladder. */
export function pipelineWarnings(input: {
  ringingDetector: { count: number; periodSeconds: number } | null
  splitFsr: number
  finesse: number
  /** Heights of the two tall resonances read as TEM00 when they fit one TEM00 and its order 1 as well; else null. */
  ladderHeights: number[] | null
}): EngineWarning[] {
  const warnings: EngineWarning[] = []
  const r = input.ringingDetector
  if (r) {
    warnings.push({
      code: 'detector_ringing',
      message: `${r.count} small peaks follow the resonances at a constant spacing of ${fmt(r.periodSeconds * 1e6)} µs (${fmt(1e-3 / r.periodSeconds)} kHz), each lower than the one before: the detector or its amplifier rings. They are folded into the resonance they follow (their area counts with it) and are not read as resonances. A detector this slow also reshapes the lines, so the linewidth and the finesse read wrong (by some tens of per cent); a faster photodiode or a lower amplifier gain removes the ringing.`,
    })
  }
  if (input.splitFsr > 0) {
    warnings.push({
      code: 'split_orders',
      message: `The transverse orders are split: order N shows up to N + 1 lines about ${fmt(input.splitFsr * input.finesse)} linewidths (${input.splitFsr.toPrecision(2)} FSR) apart, as astigmatism makes the Gouy phase differ between the two transverse axes (tilted or off-axis mirrors). Each line is measured and the order's power is their sum.`,
    })
  }
  const h = input.ladderHeights
  if (h) {
    warnings.push({
      code: 'comb_or_ladder',
      message: `The two tall resonances were read as two TEM00 one FSR apart, but they fit one TEM00 and its order-1 mode just as well (the smaller is ${fmt((100 * Math.min(...h)) / Math.max(...h))} % of the taller and nothing else is seen). Sweep over more than one FSR so that a third TEM00 or the other orders decide it.`,
    })
  }
  return warnings
}

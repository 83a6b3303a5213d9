import { transverseOffsetFsr, type DegenerateOrders } from '../../../shared/cavity'

/** One transverse order on the one-FSR diagram. */
export interface OrderTick {
  order: number
  /** Offset above TEM00 in FSR units, folded into [0, 1). */
  offsetFsr: number
  /** Other orders (0 … maxOrder) it cannot be told apart from, by the cavity model's degeneracy test. */
  degenerateWith: number[]
  /** Label row (0 = nearest the axis) so labels of close orders do not overlap. */
  labelRow: number
}

/**
 * Where orders 1 … maxOrder fall within one FSR (N ψ / π mod 1; Kogelnik & Li, Appl. Opt. 5, 1550 (1966)),
 * with degenerate partners from the cavity model and label rows assigned so that labels closer than
 * `minLabelGapFsr` stack instead of overlapping.
 */
export function orderTicks(gouyOneWayRad: number, degenerate: readonly DegenerateOrders[], maxOrder = 6, minLabelGapFsr = 0.045): OrderTick[] {
  const ticks: OrderTick[] = []
  for (let order = 1; order <= maxOrder; order++) {
    const partners = degenerate
      .filter((pair) => pair.orders.includes(order))
      .map((pair) => (pair.orders[0] === order ? pair.orders[1] : pair.orders[0]))
      .filter((other) => other <= maxOrder)
      .sort((a, b) => a - b)
    ticks.push({ order, offsetFsr: transverseOffsetFsr(order, gouyOneWayRad), degenerateWith: partners, labelRow: 0 })
  }
  // Greedy rows, left to right: each label takes the lowest row whose last label is far enough away.
  const rowEnds: number[] = []
  for (const tick of [...ticks].sort((a, b) => a.offsetFsr - b.offsetFsr || a.order - b.order)) {
    let row = rowEnds.findIndex((end) => tick.offsetFsr - end >= minLabelGapFsr)
    if (row < 0) row = rowEnds.length
    rowEnds[row] = tick.offsetFsr
    tick.labelRow = row
  }
  return ticks
}

import { transverseOffsetFsr } from '../cavity'

export interface OrderFamilies {
  /** The lowest order of each family, ascending: the only orders assigned and reported. */
  leaders: number[]
  /** Family leader of every order 0 … maxOrder. */
  leaderOf: number[]
}

/**
 * Groups transverse orders whose resonances fall within `thresholdFsr` of each other on the FSR circle (mod 1):
 * such orders cannot be told apart by position, so each group is reported as its lowest member, which usually
 * carries most of the power (common practice). With ψ = π/4 (L = R/2) orders N and N + 4 coincide
 * (Siegman, "Lasers" (1986), ch. 19), giving the families 0/4/8, 1/5/9, 2/6/10, 3/7.
 */
export function orderFamilies(gouyOneWayRad: number, maxOrder: number, thresholdFsr: number): OrderFamilies {
  const leaderOf: number[] = []
  const leaders: number[] = []
  for (let order = 0; order <= maxOrder; order++) {
    const offset = transverseOffsetFsr(order, gouyOneWayRad)
    const match = leaders.find((leader) => {
      const d = Math.abs(offset - transverseOffsetFsr(leader, gouyOneWayRad))
      return Math.min(d, 1 - d) <= thresholdFsr
    })
    if (match === undefined) {
      leaders.push(order)
      leaderOf.push(order)
    } else {
      leaderOf.push(match)
    }
  }
  return { leaders, leaderOf }
}

import { transverseOffsetFsr } from '../cavity'
import type { SweepCalibration } from '../calibration/calibrateSweep'
import { fmt } from '../numbers'
import type { OrderAssignment } from './assignOrders'
import { fitOrderPowers } from './fitOrderPowers'
import { lineProblem, orderHeightSums, SUPPORT_LINEWIDTHS } from './lineProblem'
import { MAX_MODEL_CHI_SQUARE, type ShareInputs } from './measureOrderShares'

/** Difference of the transverse evidence (Σ z² over orders ≥ 1) that settles a direction: about 3σ (common practice). */
const DIRECTION_EVIDENCE = 9

/**
 * The sweep direction from the line model when the resonances found leave it open. For each direction every order
 * is fitted at its predicted places (the matched filter over all FSRs); the evidence is Σ z² over orders ≥ 1 with
 * z the summed height over its standard error, counting only positive z (a power cannot be negative). The direction
 * whose evidence is higher by DIRECTION_EVIDENCE wins and its assignment is redone with that direction imposed;
 * otherwise the assignment's own choice stands. Null when the line model cannot be set up.
 */
export function directionByLineModel<O extends { assignment: OrderAssignment; calibration: SweepCalibration; gouy: number }>(
  inputFor: (direction: 'up' | 'down', outcome: O) => ShareInputs,
  outcome: O,
  assignAndRefine: (directions: ('up' | 'down')[]) => O,
): { outcome: O; evidence: string } | null {
  // When the orders' places mirror onto one another (ψ near a simple fraction of π) the two directions put lines
  // at the same places with the orders swapped: the line model has nothing to add to the assignment's prior.
  const probe = inputFor(outcome.assignment.direction, outcome)
  const offsets = probe.orders.filter((order) => order > 0).map((order) => transverseOffsetFsr(order, probe.gouy))
  const near = Math.max(2 / probe.finesse, 1e-3)
  const circular = (d: number) => Math.abs(d - Math.round(d))
  if (offsets.every((a) => offsets.some((b) => circular(a + b) <= near))) return null
  const evidence = (['up', 'down'] as const).map((d) => {
    // Each direction at its own refined calibration and Gouy phase.
    const own = d === outcome.assignment.direction ? outcome : assignAndRefine([d])
    const input = inputFor(d, own)
    if (input.orders.length < 2) return null
    const problem = lineProblem(input)
    // All samples: the weak lines need every one of them (the coarse set would cost √stride in significance).
    const on = problem.all
    if (on.y.length <= problem.lines.length + 3) return null
    const fit = fitOrderPowers(on.y, on.nu, problem.lines, {
      finesse: input.finesse,
      sidebands: input.sidebands,
      sigmaV: input.sigmaV,
      supportLinewidths: SUPPORT_LINEWIDTHS,
      stepFsr: on.stepFsr,
      background: on.background,
      areaLinewidths: 0,
    })
    // A model that does not follow the data (split, ringing or distorted lines) cannot tell the directions apart;
    // a moderate misfit widens the errors by √χ²ᵥ (common practice).
    if (!(fit.reducedChiSquare <= MAX_MODEL_CHI_SQUARE)) return null
    const widen = Math.sqrt(Math.max(1, fit.reducedChiSquare))
    const z = input.orders
      .filter((order) => order > 0)
      .map((order) => {
        const { heightSum, heightVariance } = orderHeightSums(problem.lines, fit, order)
        return { order, z: heightVariance > 0 ? heightSum / (widen * Math.sqrt(heightVariance)) : 0 }
      })
    return { direction: d, own, total: z.reduce((sum, o) => sum + Math.max(0, o.z) ** 2, 0), z }
  })
  if (!evidence[0] || !evidence[1]) return null
  const [up, down] = evidence as NonNullable<(typeof evidence)[number]>[]
  const winner = up.total >= down.total ? up : down
  const loser = winner === up ? down : up
  const meaning = (d: 'up' | 'down') => (d === 'up' ? 'optical frequency rises with time' : 'optical frequency falls with time')
  const strongest = winner.z.reduce((a, b) => (b.z > a.z ? b : a))
  if (winner.total - loser.total < DIRECTION_EVIDENCE) {
    return {
      outcome,
      evidence: `${outcome.assignment.directionEvidence} The weak lines measured at their predicted places over every FSR do not decide it either (evidence ${fmt(up.total)} for up, ${fmt(down.total)} for down).`,
    }
  }
  return {
    outcome: winner.own,
    evidence: `No transverse resonance settled the direction on its own; measured at their predicted places over every FSR, the transverse orders stand out for ${winner.direction} (${meaning(winner.direction)}): order ${strongest.order} at ${fmt(strongest.z)}σ, evidence ${fmt(winner.total)} against ${fmt(loser.total)} for ${loser.direction}.`,
  }
}

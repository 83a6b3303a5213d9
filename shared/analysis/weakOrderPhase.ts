import { gouyByFolding, type FoldingInputs } from '../orders/gouyByFolding'

/**
 * The folded weak lines set ψ when they explain this much more χ² there than at the geometry's ψ (25: a 5σ line,
 * common practice for a detection among many trials).
 */
const FOLDED_SIGNIFICANCE = 25
/** … and the other direction's best phase explains this much less (3σ), or the reading is mirrored. */
const FOLDED_MIRROR_MARGIN = 9

export interface WeakOrderPhase {
  gouyRad: number
  direction: 'up' | 'down'
  /** False when the mirror image fits as well: the lines are measured where either puts them, nothing is claimed. */
  claimed: boolean
  /** What decided the direction, when the weak orders changed it or left it open; null otherwise. */
  evidence: string | null
}

/**
 * Stage 7b of the pipeline: when no resonance was found at a low order's place to measure ψ, the weak lines summed
 * over every FSR may still hold it (a wrong length entered and a well-matched beam: the weak orders then sit off
 * their predicted places and would be measured as nothing). Null when they say nothing beyond the geometry.
 */
export function weakOrderPhase(input: FoldingInputs): WeakOrderPhase | null {
  const folded = gouyByFolding(input)
  if (!folded || folded.chiSquareExplained - folded.chiSquareAtPredicted < FOLDED_SIGNIFICANCE || Math.abs(folded.gouyRad / input.predictedGouyRad - 1) <= 0.002) return null
  // Read the other way, orders N at 1 − N·ψ′/π may meet the same lines (orders 2 and 4 on 1 and 2): the lines are then
  // measured all the same, but neither ψ nor the direction is claimed.
  const mirrored = folded.mirror !== null && folded.chiSquareExplained - folded.mirror.chiSquareExplained < FOLDED_MIRROR_MARGIN
  const other = folded.direction === 'up' ? 'down' : 'up'
  const evidence = mirrored
    ? `No transverse resonance stands out on its own; summed over every FSR the weak orders stand at their places read either way (sweep ${folded.direction} with ψ = ${folded.gouyRad.toFixed(3)} rad, or ${other} with ψ = ${folded.mirror!.gouyRad.toFixed(3)} rad): the direction is not settled, and the weak orders are measured where either puts them.`
    : folded.direction !== input.direction
      ? `No transverse resonance stands out on its own; summed over every FSR the weak orders stand at their places read ${folded.direction}.`
      : null
  return { gouyRad: folded.gouyRad, direction: folded.direction, claimed: !mirrored, evidence }
}

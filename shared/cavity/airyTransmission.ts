import { assertFiniteNumber, assertPositive } from './assertions'

/**
 * Airy transmission of a Fabry–Perot cavity, normalised to 1 on resonance, as a function of the round-trip phase
 * detuning δ (rad): T = 1 / (1 + (2F/π)² sin²(δ/2)), with F the finesse.
 * Source: Born & Wolf, "Principles of Optics", §7.6 (coefficient of finesse (2F/π)²).
 */
export function airyTransmission(phaseDetuningRad: number, finesse: number): number {
  assertFiniteNumber(phaseDetuningRad, 'phaseDetuningRad')
  assertPositive(finesse, 'finesse')
  const s = Math.sin(phaseDetuningRad / 2)
  const coefficient = (2 * finesse) / Math.PI
  return 1 / (1 + coefficient * coefficient * s * s)
}

import { transverseOffsetFsr } from '../cavity'

/**
 * Predicted offset of each transverse order N = 0 … maxOrder above TEM00, in FSR units folded into [0, 1):
 * N·ψ/π mod 1 (Siegman, "Lasers" (1986), ch. 19; Kogelnik & Li, Appl. Opt. 5, 1550 (1966)).
 */
export function predictOrderOffsets(gouyOneWayRad: number, maxOrder = 10): number[] {
  const offsets: number[] = []
  for (let order = 0; order <= maxOrder; order++) offsets.push(transverseOffsetFsr(order, gouyOneWayRad))
  return offsets
}

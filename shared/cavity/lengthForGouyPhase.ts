import { gouyPhaseOneWay } from './gouyPhaseOneWay'
import type { CavityGeometry } from './geometrySchema'

/**
 * The mirror spacing that gives a two-mirror cavity with the entered radii the one-way Gouy phase ψ:
 * (1 − L/R1)(1 − L/R2) = cos²ψ (Kogelnik & Li, Appl. Opt. 5, 1550 (1966)), a quadratic in L (linear with one flat
 * mirror: L = R sin²ψ). Of its roots, the one whose Gouy phase on the same branch (ψ below or above π/2) is ψ and that
 * lies nearest the entered length; null when none does (two flat mirrors, or ψ out of reach of these radii).
 */
export function lengthForGouyPhase(geometry: CavityGeometry, gouyRad: number): number | null {
  const { roc1Mm, roc2Mm, lengthMm } = geometry
  const inverse1 = roc1Mm === null ? 0 : 1 / roc1Mm
  const inverse2 = roc2Mm === null ? 0 : 1 / roc2Mm
  const a = inverse1 * inverse2
  const b = -(inverse1 + inverse2)
  const c = Math.sin(gouyRad) ** 2
  const roots: number[] = []
  if (Math.abs(a) < 1e-300) {
    if (b !== 0) roots.push(-c / b)
  } else {
    const discriminant = b * b - 4 * a * c
    if (discriminant >= 0) roots.push((-b - Math.sqrt(discriminant)) / (2 * a), (-b + Math.sqrt(discriminant)) / (2 * a))
  }
  const fitting = roots.filter((length) => {
    if (!(length > 0)) return false
    const g1 = 1 - length * inverse1
    const g2 = 1 - length * inverse2
    if (!(g1 * g2 > 0 && g1 * g2 < 1)) return false
    return Math.abs(gouyPhaseOneWay(g1, g2) - gouyRad) < 1e-6
  })
  if (fitting.length === 0) return null
  return fitting.reduce((best, length) => (Math.abs(length - lengthMm) < Math.abs(best - lengthMm) ? length : best))
}

import type { Complex } from './complex'
import type { PlacedLens } from './types'

/**
 * q at path position `toMm`, starting from q at `fromMm` and passing every thin lens standing in between
 * (a lens exactly at `toMm` counts as passed; at `fromMm` as not yet passed). Free space adds the distance to q; a
 * thin lens maps 1/q → 1/q − 1/f. Lenses need not be sorted. Only forward travel (toMm ≥ fromMm) is supported.
 * Source: Kogelnik & Li, Appl. Opt. 5, 1550 (1966).
 */
export function propagateBeamParameter(q: Complex, fromMm: number, lenses: readonly PlacedLens[], toMm: number): Complex {
  const inside = lenses.filter((l) => l.zMm > fromMm && l.zMm <= toMm).sort((p, r) => p.zMm - r.zMm)
  let re = q.re
  let im = q.im
  let at = fromMm
  for (const lens of inside) {
    re += lens.zMm - at
    at = lens.zMm
    // q' = q f / (f − q), the thin-lens law written out on plain numbers.
    const f = lens.focalLengthMm
    const dr = f - re
    const den = dr * dr + im * im
    const nextRe = (f * (re * f - re * re - im * im)) / den
    im = (f * f * im) / den
    re = nextRe
  }
  return { re: re + (toMm - at), im }
}

import { assertArgument, assertBeam, assertFiniteNumber, assertLenses } from './assertions'
import { beamParameterAt } from './beamParameterAt'
import type { Beam, PlacedLens } from './types'

export interface BeamRadiusCurve {
  zMm: Float64Array
  /** Real-beam 1/e² radius per sample, mm. */
  radiusXMm: Float64Array
  radiusYMm: Float64Array
}

/**
 * Beam radius w(z) along the path through thin lenses, sampled at `points` evenly spaced positions from `zFromMm`
 * to `zToMm` (for a chart). Lens positions are always added as extra samples so the chart shows the kink at each lens.
 * Source: ABCD law, Kogelnik & Li, Appl. Opt. 5, 1550 (1966); W² = M²λ|q|²/(π Im q), Siegman, "Lasers" (1986), ch. 17.
 */
export function beamRadiusAlongPath(
  beam: Beam,
  lenses: readonly PlacedLens[],
  zFromMm: number,
  zToMm: number,
  points = 200,
): BeamRadiusCurve {
  assertBeam(beam)
  assertLenses(lenses)
  assertFiniteNumber(zFromMm, 'zFromMm')
  assertFiniteNumber(zToMm, 'zToMm')
  assertArgument(zToMm > zFromMm, `zToMm (${zToMm}) must be greater than zFromMm (${zFromMm})`)
  assertArgument(Number.isInteger(points) && points >= 2 && points <= 100000, 'points must be an integer from 2 to 100000')
  const sorted = [...lenses].sort((a, b) => a.zMm - b.zMm)
  const samples: number[] = []
  for (let i = 0; i < points; i++) samples.push(zFromMm + ((zToMm - zFromMm) * i) / (points - 1))
  for (const lens of sorted) if (lens.zMm > zFromMm && lens.zMm < zToMm) samples.push(lens.zMm)
  samples.sort((a, b) => a - b)
  const zMm = Float64Array.from(samples)
  const lambdaMm = beam.wavelengthNm * 1e-6
  const trace = (axis: Beam['x']): Float64Array => {
    const out = new Float64Array(zMm.length)
    const start = Math.min(zFromMm, ...sorted.map((l) => l.zMm)) - 1
    const q0 = beamParameterAt(axis, beam.wavelengthNm, start)
    let re = q0.re
    let im = q0.im
    let at = start
    let next = 0
    for (let i = 0; i < zMm.length; i++) {
      const z = zMm[i]
      // Pass every lens at or before this sample (the sample at a lens shows the radius there, which is continuous).
      while (next < sorted.length && sorted[next].zMm <= z) {
        re += sorted[next].zMm - at
        at = sorted[next].zMm
        const p = 1 / sorted[next].focalLengthMm
        const dRe = 1 - p * re
        const dIm = -p * im
        const den = dRe * dRe + dIm * dIm
        const nRe = (re * dRe + im * dIm) / den
        im = (im * dRe - re * dIm) / den
        re = nRe
        next++
      }
      const qRe = re + (z - at)
      out[i] = Math.sqrt((axis.m2 * lambdaMm * (qRe * qRe + im * im)) / (Math.PI * im))
    }
    return out
  }
  return { zMm, radiusXMm: trace(beam.x), radiusYMm: trace(beam.y) }
}

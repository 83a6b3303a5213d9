import type { MatchingPath } from './types'

/**
 * Coupling into the target mode with up to two thin lenses given by their powers (1/f, 1/mm; 0 = no lens) at path
 * positions zA, zB (either order), on plain numbers with no allocation: the kernel of maps and tolerance scans.
 * A thin lens maps q → q / (1 − P q) (Kogelnik & Li, Appl. Opt. 5, 1550 (1966)); overlap as in `coaxialCoupling`.
 */
export function twoLensCoupling(path: MatchingPath, powerA: number, zA: number, powerB: number, zB: number): number {
  const { beam, target, cavityPlaneMm } = path
  const first = zA <= zB ? zA : zB
  const second = zA <= zB ? zB : zA
  const p1 = zA <= zB ? powerA : powerB
  const p2 = zA <= zB ? powerB : powerA
  const tRe = -target.waistFromEntranceMm - cavityPlaneMm // target q at path position 0, propagated backwards
  const tIm = target.rayleighRangeMm
  const lambdaMm = beam.wavelengthNm * 1e-6
  let product = 1
  for (let axis = 0; axis < 2; axis++) {
    const a = axis === 0 ? beam.x : beam.y
    let re = first - a.waistPositionMm
    let im = (Math.PI * a.waistRadiusMm * a.waistRadiusMm) / (a.m2 * lambdaMm)
    // Lens 1, free space to lens 2, lens 2, then free space to the cavity plane (compared at path position 0 below).
    let dRe = 1 - p1 * re
    let dIm = -p1 * im
    let den = dRe * dRe + dIm * dIm
    let nRe = (re * dRe + im * dIm) / den
    im = (im * dRe - re * dIm) / den
    re = nRe + (second - first)
    dRe = 1 - p2 * re
    dIm = -p2 * im
    den = dRe * dRe + dIm * dIm
    nRe = (re * dRe + im * dIm) / den
    im = (im * dRe - re * dIm) / den
    re = nRe - second // the same q moved back to path position 0 in free space, where the target q is expressed
    const sRe = re - tRe
    const sIm = im + tIm
    product *= (4 * im * tIm) / (sRe * sRe + sIm * sIm)
  }
  return Math.min(1, Math.sqrt(product))
}

/**
 * Minimum of a smooth function near x0 on a log scale by successive parabolas through three points (inverse
 * parabolic interpolation, Press et al., "Numerical Recipes", §10.2): a bracket of ±6 % walked towards the lower
 * side until it holds the minimum, then a parabola, then a second one at a quarter of the spacing. About seven
 * evaluations, against a dozen for a golden-section search to the same precision. Kept within [lo, hi].
 */
export function parabolicMinimum(f: (x: number) => number, x0: number, lo: number, hi: number): number {
  const a = Math.log(lo)
  const b = Math.log(hi)
  const at = (u: number) => f(Math.exp(Math.min(b, Math.max(a, u))))
  const vertex = (u: number, h: number, fm: number, f0: number, fp: number) => {
    const curvature = fp - 2 * f0 + fm
    if (!(curvature > 0)) return fm < fp ? u - h : u + h
    return Math.min(u + h, Math.max(u - h, u - (h * (fp - fm)) / (2 * curvature)))
  }
  let h = 0.06
  let u = Math.log(x0)
  let fm = at(u - h)
  let f0 = at(u)
  let fp = at(u + h)
  for (let step = 0; step < 3 && !(f0 <= fm && f0 <= fp); step++) {
    if (fm < fp) {
      u -= h
      fp = f0
      f0 = fm
      fm = at(u - h)
    } else {
      u += h
      fm = f0
      f0 = fp
      fp = at(u + h)
    }
  }
  u = vertex(u, h, fm, f0, fp)
  h /= 4
  u = vertex(u, h, at(u - h), at(u), at(u + h))
  return Math.exp(Math.min(b, Math.max(a, u)))
}

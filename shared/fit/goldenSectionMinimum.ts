/**
 * Minimum of a unimodal function on [a, b] by golden-section search, on a log scale (Press et al., "Numerical
 * Recipes", §10.2 (Kiefer's method)); `iterations` steps shrink the bracket by 0.618 each.
 */
export function goldenSectionMinimum(f: (x: number) => number, a: number, b: number, iterations: number): number {
  const g = (Math.sqrt(5) - 1) / 2
  let lo = Math.log(a)
  let hi = Math.log(b)
  let x1 = hi - g * (hi - lo)
  let x2 = lo + g * (hi - lo)
  let f1 = f(Math.exp(x1))
  let f2 = f(Math.exp(x2))
  for (let k = 0; k < iterations; k++) {
    if (!(f1 <= f2) && Number.isFinite(f2)) {
      lo = x1
      x1 = x2
      f1 = f2
      x2 = lo + g * (hi - lo)
      f2 = f(Math.exp(x2))
    } else {
      hi = x2
      x2 = x1
      f2 = f1
      x1 = hi - g * (hi - lo)
      f1 = f(Math.exp(x1))
    }
  }
  return Math.exp(f1 <= f2 ? x1 : x2)
}

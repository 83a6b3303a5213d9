// Small numeric helpers shared by the engine's stages.

/** Median (the mean of the middle two for an even count; NaN for none). */
export function median(values: number[]): number {
  if (values.length === 0) return NaN
  const s = values.slice().sort((a, b) => a - b)
  const m = s.length >> 1
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2
}

/** Fractional part, in [0, 1). */
export function frac(x: number): number {
  return x - Math.floor(x)
}

/** Signed distance to the nearest whole number, in [−0.5, 0.5) (a place mod 1 FSR). */
export function signedCircular(d: number): number {
  return d - Math.round(d)
}

/** One decimal for messages, 'n/a' when not finite. */
export function fmt(x: number): string {
  return Number.isFinite(x) ? x.toFixed(1) : 'n/a'
}

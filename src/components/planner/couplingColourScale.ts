/**
 * The coupling map's colour scale (our own): deep slate for poor coupling through teal and green to a warm cream at
 * 100 %. Most stops sit above 80 %, where the decisions are made, so 95 % and 99 % look clearly different.
 */
export const couplingStops: ReadonlyArray<readonly [number, readonly [number, number, number]]> = [
  [0, [29, 36, 51]],
  [0.5, [47, 79, 111]],
  [0.8, [47, 127, 134]],
  [0.9, [95, 174, 138]],
  [0.95, [185, 210, 122]],
  [0.99, [242, 211, 107]],
  [1, [255, 244, 194]],
]

/** Colour of a cell with no mountable position. */
export const emptyCellColour = '#eceef0'

/** RGB of a coupling (0–1), interpolated linearly between the stops. */
export function couplingRgb(coupling: number): [number, number, number] {
  const c = Math.min(1, Math.max(0, coupling))
  for (let i = 1; i < couplingStops.length; i++) {
    const [at, rgb] = couplingStops[i]
    if (c <= at) {
      const [from, rgbFrom] = couplingStops[i - 1]
      const t = (c - from) / (at - from)
      return [0, 1, 2].map((k) => Math.round(rgbFrom[k] + t * (rgb[k] - rgbFrom[k]))) as [number, number, number]
    }
  }
  return [...couplingStops[couplingStops.length - 1][1]] as [number, number, number]
}

export function couplingColour(coupling: number | null): string {
  if (coupling === null || !Number.isFinite(coupling)) return emptyCellColour
  const [r, g, b] = couplingRgb(coupling)
  return `rgb(${r}, ${g}, ${b})`
}

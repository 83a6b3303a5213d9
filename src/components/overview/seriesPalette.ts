/**
 * Colours for one series per cavity on the comparison chart, from the eight-colour set of Okabe & Ito,
 * "Color Universal Design" (2008), which stays distinguishable under the common forms of colour-vision
 * deficiency; the set's yellow is darkened so it reads on white. Each series also gets its own dash
 * pattern, so the lines differ without colour too.
 */
const SERIES_COLOURS = ['#0072B2', '#D55E00', '#009E73', '#CC79A7', '#E69F00', '#56B4E9', '#B8A200', '#000000'] as const
const SERIES_DASHES: ReadonlyArray<number[] | undefined> = [undefined, [8, 4], [2, 3], [10, 3, 2, 3]]

/** Colour of the i-th series (cycling past eight). */
export function seriesColour(index: number): string {
  return SERIES_COLOURS[((index % SERIES_COLOURS.length) + SERIES_COLOURS.length) % SERIES_COLOURS.length]
}

/** Dash pattern of the i-th series (solid first), or undefined for solid. */
export function seriesDash(index: number): number[] | undefined {
  return SERIES_DASHES[((index % SERIES_DASHES.length) + SERIES_DASHES.length) % SERIES_DASHES.length]
}

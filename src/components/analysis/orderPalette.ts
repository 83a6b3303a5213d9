import type { AnalysisPeak } from '../../../shared/analysis/types'

/**
 * Colours for transverse orders, drawn from the eight-colour set of Okabe & Ito, "Color Universal Design"
 * (2008), which stays distinguishable under the common forms of colour-vision deficiency. The assignment is
 * ours: TEM00 in the deep blue, the two orders a tuner acts on (1: misalignment, 2: mismatch) in the two
 * most contrasting warm/green hues, higher orders in the rest. The set's yellow is darkened to an ochre so
 * it reads on a white background.
 */
const ORDER_COLOURS = ['#0072B2', '#D55E00', '#009E73', '#CC79A7', '#E69F00', '#56B4E9', '#B8A200'] as const

/** Orders above the palette, unassigned resonances and sidebands. */
export const OTHER_ORDER_COLOUR = '#6b7178'
export const SIDEBAND_COLOUR = '#000000'

/** Colour of transverse order `order` (null = unassigned). */
export function orderColour(order: number | null): string {
  if (order === null || !Number.isInteger(order) || order < 0) return OTHER_ORDER_COLOUR
  return ORDER_COLOURS[order] ?? OTHER_ORDER_COLOUR
}

/** Colour of a resonance marker: by order for carriers, its own for sidebands and unassigned ones. */
export function peakColour(peak: Pick<AnalysisPeak, 'order' | 'kind'>): string {
  if (peak.kind === 'sideband') return SIDEBAND_COLOUR
  if (peak.kind === 'unassigned') return OTHER_ORDER_COLOUR
  return orderColour(peak.order)
}

/** Short label written above a resonance marker. */
export function peakLabel(peak: Pick<AnalysisPeak, 'order' | 'kind'>): string {
  if (peak.kind === 'sideband') return peak.order === null ? 'SB' : `SB${peak.order}`
  if (peak.kind === 'unassigned' || peak.order === null) return '?'
  return String(peak.order)
}

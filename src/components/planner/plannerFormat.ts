/** Number formats of the planner: couplings as percent (more digits near 100 %), losses in points, lengths in mm and µm. */

/** 97.3 %, or 99.95 % above 99 % where the last digits matter. */
export function formatPercentCoupling(fraction: number | null | undefined): string {
  if (fraction == null || !Number.isFinite(fraction)) return '—'
  return `${(fraction * 100).toFixed(fraction >= 0.99 ? 2 : 1)} %`
}

/**
 * A coupling change in percentage points, signed the way it reads: a loss is "−0.12 pts"; small changes keep two
 * significant digits ("−0.0034 pts") so a forgiving mount still shows how forgiving.
 */
export function formatLoss(loss: number): string {
  const points = -loss * 100
  const size = Math.abs(points)
  if (size < 5e-5) return '0 pts'
  const digits = size >= 0.1 ? size.toFixed(2) : String(Number(size.toPrecision(2)))
  return `${points > 0 ? '+' : '−'}${digits} pts`
}

export function formatMm(value: number | null | undefined, digits = 1): string {
  if (value == null || !Number.isFinite(value)) return '—'
  return `${Number(value.toFixed(digits))} mm`
}

export function formatUm(valueMm: number | null | undefined, digits = 1): string {
  if (valueMm == null || !Number.isFinite(valueMm)) return '—'
  return `${Number((valueMm * 1000).toFixed(digits))} µm`
}

/** An uncertainty with two significant digits (so a tiny one does not print as 0), in mm or, with `unit: 'um'`, µm. */
export function formatUncertainty(valueMm: number | null | undefined, unit: 'mm' | 'um' = 'mm'): string {
  if (valueMm == null || !Number.isFinite(valueMm)) return '—'
  const value = unit === 'um' ? valueMm * 1000 : valueMm
  return `${value === 0 ? '0' : String(Number(value.toPrecision(2)))} ${unit === 'um' ? 'µm' : 'mm'}`
}

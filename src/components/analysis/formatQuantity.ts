/** Display formats for the physical quantities on the cavity, tuning and analysis pages. */

const NBSP = '\u00a0'

/** A frequency with an SI prefix chosen for 3–4 significant digits: "1.499 GHz", "312 kHz". */
export function formatFrequency(hz: number | null | undefined, digits = 4): string {
  if (hz === null || hz === undefined || !Number.isFinite(hz)) return '—'
  const units: [number, string][] = [
    [1e9, 'GHz'],
    [1e6, 'MHz'],
    [1e3, 'kHz'],
    [1, 'Hz'],
  ]
  const [scale, unit] = units.find(([s]) => Math.abs(hz) >= s) ?? units[units.length - 1]
  return `${trimPrecision(hz / scale, digits)}${NBSP}${unit}`
}

/** A length given in metres, shown in µm, mm or m. */
export function formatLength(metres: number | null | undefined, digits = 4): string {
  if (metres === null || metres === undefined || !Number.isFinite(metres)) return '—'
  const abs = Math.abs(metres)
  if (abs !== 0 && abs < 1e-3) return `${trimPrecision(metres * 1e6, digits)}${NBSP}µm`
  if (abs < 1) return `${trimPrecision(metres * 1e3, digits)}${NBSP}mm`
  return `${trimPrecision(metres, digits)}${NBSP}m`
}

/** A fraction (0–1) as a percentage: "86.2 %". */
export function formatPercent(fraction: number | null | undefined, decimals = 1): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return '—'
  return `${(fraction * 100).toFixed(decimals)}${NBSP}%`
}

/**
 * A standard error of a share in percentage points, never rounded to a bare "0.0": two significant digits below one
 * point ("0.012"), one decimal above ("1.4").
 */
export function formatShareError(fraction: number | null | undefined): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return '—'
  const points = Math.abs(fraction) * 100
  if (points === 0) return '0'
  return points >= 1 ? points.toFixed(1) : String(Number(points.toPrecision(2)))
}

/** A time in seconds with an SI prefix: "12.5 µs". */
export function formatSeconds(seconds: number | null | undefined, digits = 4): string {
  if (seconds === null || seconds === undefined || !Number.isFinite(seconds)) return '—'
  const abs = Math.abs(seconds)
  const units: [number, string][] = [
    [1, 's'],
    [1e-3, 'ms'],
    [1e-6, 'µs'],
    [1e-9, 'ns'],
  ]
  const [scale, unit] = abs === 0 ? units[0] : (units.find(([s]) => abs >= s) ?? units[units.length - 1])
  return `${trimPrecision(seconds / scale, digits)}${NBSP}${unit}`
}

/** A plain number to `digits` significant digits without trailing zeros or exponent for ordinary sizes. */
export function trimPrecision(value: number, digits = 4): string {
  if (!Number.isFinite(value)) return '—'
  if (value === 0) return '0'
  const text = Number(value.toPrecision(digits))
  return Math.abs(text) >= 1e-4 && Math.abs(text) < 1e7 ? String(text) : text.toExponential(digits - 1)
}

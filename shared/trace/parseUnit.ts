/** What a unit label means once normalised: the SI unit it converts to and the factor to get there. */
export interface ParsedUnit {
  /** 'V', 's', 'Hz', 'A', or the label as printed when the reader does not know it ('' when none). */
  unit: string
  /** Multiply printed values by this to get `unit` (e.g. 1e-3 for mV → V). */
  scale: number
  kind: 'voltage' | 'time' | 'rate' | 'current' | 'other' | 'none'
}

const VOLTAGE: Record<string, number> = {
  v: 1, volt: 1, volts: 1, kv: 1e3, mv: 1e-3, millivolt: 1e-3, millivolts: 1e-3, uv: 1e-6, microvolt: 1e-6,
  microvolts: 1e-6, nv: 1e-9,
}
const TIME: Record<string, number> = {
  s: 1, sec: 1, secs: 1, second: 1, seconds: 1, ms: 1e-3, msec: 1e-3, millisecond: 1e-3, milliseconds: 1e-3,
  us: 1e-6, usec: 1e-6, microsecond: 1e-6, microseconds: 1e-6, ns: 1e-9, nsec: 1e-9, nanosecond: 1e-9,
  nanoseconds: 1e-9, ps: 1e-12,
}
// Rates are case sensitive where milli and mega collide (mS/s vs MS/s); sample rates are never milli.
const RATE: Record<string, number> = {
  hz: 1, khz: 1e3, mhz: 1e6, ghz: 1e9, 's/s': 1, 'sa/s': 1, 'samples/s': 1, 'ks/s': 1e3, 'ksa/s': 1e3,
  'ms/s': 1e6, 'msa/s': 1e6, 'gs/s': 1e9, 'gsa/s': 1e9,
}
const CURRENT: Record<string, number> = { a: 1, amp: 1, amps: 1, ma: 1e-3, ua: 1e-6, na: 1e-9 }

/**
 * Normalise a printed unit label ("mV", "Volts", "µs", "(ms)", "[V]", "us") to an SI unit and a factor.
 * Both micro signs (U+00B5 and U+03BC) read as "u". Unknown labels pass through with factor 1.
 */
export function parseUnit(label: string | undefined | null): ParsedUnit {
  const printed = (label ?? '').trim().replace(/^[([{]\s*|\s*[)\]}]$/g, '').trim()
  if (printed === '') return { unit: '', scale: 1, kind: 'none' }
  const key = printed.replace(/[\u00b5\u03bc]/g, 'u').toLowerCase()
  if (key in VOLTAGE) return { unit: 'V', scale: VOLTAGE[key], kind: 'voltage' }
  if (key in TIME) return { unit: 's', scale: TIME[key], kind: 'time' }
  if (key in RATE) return { unit: 'Hz', scale: RATE[key], kind: 'rate' }
  if (key in CURRENT) return { unit: 'A', scale: CURRENT[key], kind: 'current' }
  return { unit: printed, scale: 1, kind: 'other' }
}

/** A number with an optional unit, as printed in a metadata value ("10 us", "9.99E-6", "2,5 ms"). */
export interface ParsedQuantity {
  value: number
  unit: ParsedUnit
}

const QUANTITY = /^\s*([+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:[eE][+-]?\d+)?)\s*(.*?)\s*$/

/** Read "number [unit]" from a metadata value; null when it does not start with a number. */
export function parseQuantity(text: string | undefined): ParsedQuantity | null {
  if (text === undefined) return null
  const match = QUANTITY.exec(text)
  if (!match) return null
  const value = Number(match[1].replace(',', '.'))
  if (!Number.isFinite(value)) return null
  return { value, unit: parseUnit(match[2]) }
}

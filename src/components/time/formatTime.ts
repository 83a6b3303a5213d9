/**
 * Times as the lab reads them everywhere in the app: ISO 8601 dates (2026-12-03) and a 24-hour clock, in the
 * browser's time zone. No locale month names, no AM/PM: a table sorts and reads the same in every lab.
 */

const two = (n: number) => String(n).padStart(2, '0')

/** "2026-12-03" (local date); a dash for none. */
export function formatDate(iso: string | Date | null | undefined): string {
  if (!iso) return '—'
  const d = new Date(iso)
  return `${d.getFullYear()}-${two(d.getMonth() + 1)}-${two(d.getDate())}`
}

/** "14:05" or, with seconds, "14:05:09" (24-hour, local). */
export function formatClock(iso: string | Date, options: { seconds?: boolean } = {}): string {
  const d = new Date(iso)
  return `${two(d.getHours())}:${two(d.getMinutes())}${options.seconds ? `:${two(d.getSeconds())}` : ''}`
}

/** "2026-12-03 14:05" (or with seconds); a dash for none. */
export function formatDateTime(iso: string | Date | null | undefined, options: { seconds?: boolean } = {}): string {
  if (!iso) return '—'
  return `${formatDate(iso)} ${formatClock(iso, options)}`
}

/** The clock alone when `iso` is on the same local day as `now`, else the date too. */
export function formatRecent(iso: string | Date, now: Date = new Date(), options: { seconds?: boolean } = {}): string {
  return formatDate(iso) === formatDate(now) ? formatClock(iso, options) : formatDateTime(iso, options)
}

import { formatDateTime } from '../time/formatTime'

/** Dates in account tables: ISO date and 24-hour time to the minute, or a dash for never. */
export function formatWhen(iso: string | null | undefined): string {
  return formatDateTime(iso)
}

/** Picking two analyses to compare: a click toggles one; a third pick drops the oldest pick. */
export function togglePick(picked: readonly string[], id: string, max = 2): string[] {
  if (picked.includes(id)) return picked.filter((item) => item !== id)
  return [...picked, id].slice(-max)
}

/**
 * The comparison address for two picks, older analysis first (so "b − a" reads as after − before), by
 * their times; null until two are picked.
 */
export function comparePath(picked: readonly string[], timeOf: (id: string) => string | undefined): string | null {
  if (picked.length !== 2) return null
  const [first, second] = [...picked].sort((x, y) => Date.parse(timeOf(x) ?? '') - Date.parse(timeOf(y) ?? ''))
  return `/compare?a=${encodeURIComponent(first)}&b=${encodeURIComponent(second)}`
}

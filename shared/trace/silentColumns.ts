import { CellKind } from './classifyCell'

/** Columns (0-based) whose cells in `rows` are all NaN tokens or out-of-range words (none a number, none blank). */
export function silentColumns(rows: Array<{ kinds: ArrayLike<number> }>): number[] {
  const width = rows.reduce((most, row) => Math.max(most, row.kinds.length), 0)
  const silent: number[] = []
  for (let column = 0; column < width; column++) {
    const quiet = rows.length > 0 && rows.every((row) => row.kinds[column] === CellKind.Missing || row.kinds[column] === CellKind.Clipped)
    if (quiet) silent.push(column)
  }
  return silent
}

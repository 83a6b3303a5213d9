/**
 * Contour lines of a value on a regular grid (marching squares, linear interpolation along cell edges), as line
 * segments in grid coordinates. Cells with an empty corner (null) are skipped. Method: Lorensen & Cline, "Marching
 * cubes", SIGGRAPH '87 (its 2-D case).
 */
export type Segment = [x1: number, y1: number, x2: number, y2: number]

/**
 * `values[i * ny + j]` is the value at x = xs[i], y = ys[j]. Returns the segments where the value crosses `level`.
 */
export function contourSegments(values: ArrayLike<number | null>, xs: ArrayLike<number>, ys: ArrayLike<number>, level: number): Segment[] {
  const nx = xs.length
  const ny = ys.length
  const segments: Segment[] = []
  const at = (i: number, j: number) => values[i * ny + j]
  for (let i = 0; i < nx - 1; i++) {
    for (let j = 0; j < ny - 1; j++) {
      const v00 = at(i, j)
      const v10 = at(i + 1, j)
      const v11 = at(i + 1, j + 1)
      const v01 = at(i, j + 1)
      if (v00 === null || v10 === null || v11 === null || v01 === null) continue
      // Corners in order around the cell: (i, j), (i+1, j), (i+1, j+1), (i, j+1).
      const corners: [number, number, number][] = [
        [xs[i], ys[j], v00],
        [xs[i + 1], ys[j], v10],
        [xs[i + 1], ys[j + 1], v11],
        [xs[i], ys[j + 1], v01],
      ]
      const crossings: [number, number][] = []
      for (let k = 0; k < 4; k++) {
        const [xa, ya, va] = corners[k]
        const [xb, yb, vb] = corners[(k + 1) % 4]
        if ((va >= level) !== (vb >= level)) {
          const t = (level - va) / (vb - va)
          crossings.push([xa + t * (xb - xa), ya + t * (yb - ya)])
        }
      }
      // Two crossings: one segment; four (a saddle): pair them in edge order.
      for (let k = 0; k + 1 < crossings.length; k += 2) segments.push([crossings[k][0], crossings[k][1], crossings[k + 1][0], crossings[k + 1][1]])
    }
  }
  return segments
}

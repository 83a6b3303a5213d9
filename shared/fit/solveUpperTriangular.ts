/**
 * Back-substitution for the upper-triangular R left by householderQr (column-major, `rows` rows).
 * Source: Golub & Van Loan, "Matrix Computations" (3rd ed., 1996), §3.1.
 */
export function solveUpperTriangular(matrix: Float64Array, rows: number, cols: number, b: ArrayLike<number>): Float64Array {
  const x = new Float64Array(cols)
  for (let i = cols - 1; i >= 0; i--) {
    let sum = b[i]
    for (let j = i + 1; j < cols; j++) sum -= matrix[j * rows + i] * x[j]
    x[i] = sum / matrix[i * rows + i]
  }
  return x
}

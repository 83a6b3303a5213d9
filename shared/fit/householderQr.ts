/**
 * Householder QR of a dense m×p matrix (row-major, m ≥ p), applied in place: on return the upper triangle of the
 * first p rows holds R and `rhs` holds Qᵀ·rhs. Used instead of the normal equations so that the condition number is
 * not squared. Source: Golub & Van Loan, "Matrix Computations" (3rd ed., 1996), §5.1–5.2.
 */
export function householderQr(matrix: Float64Array, rows: number, cols: number, rhs: Float64Array): void {
  for (let k = 0; k < cols; k++) {
    let norm = 0
    for (let i = k; i < rows; i++) norm = Math.hypot(norm, matrix[i * cols + k])
    if (norm === 0) continue
    const diagonal = matrix[k * cols + k]
    // Reflect onto −sign(a_kk)·‖a‖ to avoid cancellation in v_k = a_kk − α.
    const alpha = diagonal > 0 ? -norm : norm
    matrix[k * cols + k] = diagonal - alpha
    let vNormSquared = 0
    for (let i = k; i < rows; i++) vNormSquared += matrix[i * cols + k] ** 2
    for (let j = k + 1; j < cols; j++) {
      let dot = 0
      for (let i = k; i < rows; i++) dot += matrix[i * cols + k] * matrix[i * cols + j]
      const factor = (2 * dot) / vNormSquared
      for (let i = k; i < rows; i++) matrix[i * cols + j] -= factor * matrix[i * cols + k]
    }
    let dotRhs = 0
    for (let i = k; i < rows; i++) dotRhs += matrix[i * cols + k] * rhs[i]
    const factorRhs = (2 * dotRhs) / vNormSquared
    for (let i = k; i < rows; i++) rhs[i] -= factorRhs * matrix[i * cols + k]
    matrix[k * cols + k] = alpha
    for (let i = k + 1; i < rows; i++) matrix[i * cols + k] = 0
  }
}

/** Solves R·x = b for upper-triangular R stored in the first p rows of a row-major matrix with p columns. */
export function solveUpperTriangular(matrix: Float64Array, cols: number, b: ArrayLike<number>): Float64Array {
  const x = new Float64Array(cols)
  for (let i = cols - 1; i >= 0; i--) {
    let sum = b[i]
    for (let j = i + 1; j < cols; j++) sum -= matrix[i * cols + j] * x[j]
    x[i] = sum / matrix[i * cols + i]
  }
  return x
}

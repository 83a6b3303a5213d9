/**
 * Householder QR of a dense m×p matrix stored column by column (element (i, j) at j·m + i, m ≥ p), applied in place:
 * on return the upper triangle holds R and `rhs` holds Qᵀ·rhs. Used instead of the normal equations so that the
 * condition number is not squared. Source: Golub & Van Loan, "Matrix Computations" (3rd ed., 1996), §5.1–5.2.
 */
export function householderQr(matrix: Float64Array, rows: number, cols: number, rhs: Float64Array): void {
  for (let k = 0; k < cols; k++) {
    const colK = k * rows
    const norm = columnNorm(matrix, colK + k, colK + rows)
    if (norm === 0) continue
    const diagonal = matrix[colK + k]
    // Reflect onto −sign(a_kk)·‖a‖ to avoid cancellation in v_k = a_kk − α.
    const alpha = diagonal > 0 ? -norm : norm
    matrix[colK + k] = diagonal - alpha
    // ‖v‖² = ‖a‖² − 2α·a_kk + α² = 2‖a‖(‖a‖ + |a_kk|), since α = −sign(a_kk)‖a‖.
    const vNormSquared = 2 * norm * (norm + Math.abs(diagonal))
    for (let j = k + 1; j < cols; j++) {
      const colJ = j * rows
      let dot = 0
      for (let i = k; i < rows; i++) dot += matrix[colK + i] * matrix[colJ + i]
      const factor = (2 * dot) / vNormSquared
      for (let i = k; i < rows; i++) matrix[colJ + i] -= factor * matrix[colK + i]
    }
    let dotRhs = 0
    for (let i = k; i < rows; i++) dotRhs += matrix[colK + i] * rhs[i]
    const factorRhs = (2 * dotRhs) / vNormSquared
    for (let i = k; i < rows; i++) rhs[i] -= factorRhs * matrix[colK + i]
    matrix[colK + k] = alpha
    for (let i = k + 1; i < rows; i++) matrix[colK + i] = 0
  }
}

/** Euclidean norm of matrix[from..to), falling back to a scaled sum when the plain one under- or overflows. */
function columnNorm(values: Float64Array, from: number, to: number): number {
  let sum = 0
  for (let i = from; i < to; i++) sum += values[i] * values[i]
  if (sum > 1e-280 && sum < 1e280) return Math.sqrt(sum)
  let largest = 0
  for (let i = from; i < to; i++) largest = Math.max(largest, Math.abs(values[i]))
  if (largest === 0 || !Number.isFinite(largest)) return largest
  let scaled = 0
  for (let i = from; i < to; i++) scaled += (values[i] / largest) ** 2
  return largest * Math.sqrt(scaled)
}

/** Result of a weighted nonlinear least-squares fit. */
export interface LeastSquaresResult {
  parameters: number[]
  /** sqrt(diag(covariance)). */
  standardErrors: number[]
  /** s² (JᵀWJ)⁻¹ at the solution, s² = RSS / (n − p). */
  covariance: number[][]
  /** Σ wᵢ (yᵢ − f(xᵢ))² at the solution. */
  residualSumOfSquares: number
  iterations: number
  converged: boolean
  /** Why the iteration stopped, in plain words. */
  message: string
}

export type ModelFactory = (parameters: number[]) => (x: number) => number

export interface LeastSquaresOptions {
  initialValues: number[]
  /** @default 1000 */
  maxIterations?: number
  /** Per-sample weights wᵢ (1/σᵢ²). @default all 1 */
  weights?: ArrayLike<number>
  minValues?: number[]
  maxValues?: number[]
  /** Analytic ∂f/∂pⱼ at x; without it a central-difference Jacobian is used. */
  jacobian?: (parameters: number[], x: number) => number[]
  /** Stop when the relative RSS improvement and relative step both fall below this. @default 1e-12 */
  relativeTolerance?: number
}

export function fitLeastSquares(
  _x: ArrayLike<number>,
  _y: ArrayLike<number>,
  _model: ModelFactory,
  _options: LeastSquaresOptions,
): LeastSquaresResult {
  throw new Error('not implemented yet')
}

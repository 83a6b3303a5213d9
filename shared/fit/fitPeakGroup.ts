export type PeakModel = 'lorentzian' | 'airy'

export interface PeakGuess {
  center: number
  height: number
  fwhm: number
}

export interface FittedPeak {
  center: number
  height: number
  fwhm: number
  area: number
  errors: { center: number; height: number; fwhm: number; area: number }
}

export interface PeakGroupFit {
  peaks: FittedPeak[]
  baseline: number
  baselineError: number
  residualSumOfSquares: number
  reducedChiSquare: number
  iterations: number
  converged: boolean
  model: PeakModel
}

export interface PeakGroupOptions {
  /** @default 'lorentzian' */
  model?: PeakModel
  /** Period of the Airy model in x units (the FSR); required for 'airy'. */
  period?: number
  /** Known noise standard deviation of y; when given, uncertainties use it instead of the residual scatter. */
  noiseSigma?: number
  /** Hold the baseline at this value instead of fitting it. */
  fixedBaseline?: number
}

export function fitPeakGroup(
  _x: ArrayLike<number>,
  _y: ArrayLike<number>,
  _guesses: PeakGuess[],
  _options: PeakGroupOptions = {},
): PeakGroupFit {
  throw new Error('not implemented yet')
}

/** Fitting: a Levenberg–Marquardt least-squares solver and the resonance (peak-group) fits built on it. */
export {
  fitLeastSquares,
  type LeastSquaresResult,
  type LeastSquaresOptions,
  type ModelFactory,
} from './fitLeastSquares'
export {
  fitPeakGroup,
  type PeakModel,
  type PeakGuess,
  type FittedPeak,
  type PeakGroupFit,
  type PeakGroupOptions,
} from './fitPeakGroup'

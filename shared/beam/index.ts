/** Gaussian-beam optics and the mode-matching planner (lengths in mm, wavelengths in nm). */
export type { Complex } from './complex'
export type { Beam, BeamAxis, PlacedLens, KitLens, TargetMode, MatchingPath } from './types'
export { beamParameterAt, rayleighRangeMm } from './beamParameterAt'
export { describeBeamParameter, type BeamState } from './describeBeamParameter'
export { applyAbcd, composeMatrices, freeSpaceMatrix, thinLensMatrix, invertMatrix, type AbcdMatrix } from './abcdMatrix'
export { propagateBeamParameter } from './propagateBeamParameter'
export { beamAt, type BeamAtPlane } from './beamAt'
export { waistAfterLenses } from './waistAfterLenses'
export { cavityEigenmodeBeam, type CavityEigenmodeBeam, type CavityEigenmodeBeamOptions, type InputSubstrate } from './cavityEigenmodeBeam'
export { axialCoupling, type AxialMismatch } from './axialCoupling'
export { coaxialCoupling } from './coaxialCoupling'
export { overlap1d, type Overlap1dOptions } from './overlap1d'
export { beamCoupling, type BeamCoupling, type BeamCouplingOptions } from './beamCoupling'
export { pathCoupling, type PathCoupling } from './pathCoupling'
export { twoLensCoupling } from './twoLensCoupling'
export { fitBeamCaustic, type CausticFit, type CausticFitOptions, type CausticMeasurements } from './fitBeamCaustic'
export { createInputBeam, type InputBeam, type InputBeamSpec, type MeasuredSpec, type WaistSpec } from './createInputBeam'
export { beamRadiusAlongPath, type BeamRadiusCurve } from './beamRadiusAlongPath'
export { couplingMap, type CouplingMap, type CouplingMapOptions, type CouplingMapRanges, type MapLens } from './couplingMap'
export { lensPositionTolerance, type ArrangementTolerance, type LensTolerance } from './lensPositionTolerance'
export { idealSingleLens, type IdealLens, type IdealSingleLens } from './idealSingleLens'
export { idealTwoLens, type IdealTwoLens, type IdealTwoLensOptions } from './idealTwoLens'
export { searchKitArrangements, type KitCandidate, type KitSearch } from './searchKitArrangements'
export { mismatchFamily, type MismatchFamily, type MismatchFamilyOptions, type MismatchPoint, type ReferenceMode } from './mismatchFamily'
export {
  planModeMatching,
  type Arrangement,
  type ModeMatchingOptions,
  type ModeMatchingPlan,
  type ModeMatchingProblem,
  type TableConstraints,
} from './planModeMatching'

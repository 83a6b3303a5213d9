/** Synthetic swept-cavity traces with known truth, for tests, accuracy checks and demo data. */
export { beamOrderPowers, drawBeamMisfit, type BeamMisfit, type BeamOrderPowersOptions } from './beamOrderPowers'
export { formatSweptTraceCsv } from './formatSweptTraceCsv'
export { generateSweptTrace } from './generateSweptTrace'
export { simPresets } from './simPresets'
export type { CavityGeometry, SimulatedPeakTruth, SweptTrace, SweptTraceOptions, SweptTraceTruth } from './types'

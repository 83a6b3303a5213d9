/** Cavity model: geometry → g-parameters, FSR, Gouy phase, eigenmode, finesse, degenerate orders. */
export { cavityGeometrySchema, type CavityGeometry } from './geometrySchema'
export {
  computeCavityModel,
  type CavityModel,
  type CavityModelOptions,
  type DegenerateOrders,
} from './computeCavityModel'
export { transverseOffsetFsr } from './transverseOffsetFsr'
export { gParameters, type GParameters } from './gParameters'
export { gouyPhaseOneWay } from './gouyPhaseOneWay'
export { lengthForGouyPhase } from './lengthForGouyPhase'
export { eigenmodeWaist, type EigenmodeWaist } from './eigenmodeWaist'
export { mirrorSpotRadii, type MirrorSpotRadii } from './mirrorSpotRadii'
export { freeSpectralRangeHz, SPEED_OF_LIGHT_M_PER_S } from './freeSpectralRangeHz'
export { finesseFromReflectivities } from './finesseFromReflectivities'
export { airyTransmission } from './airyTransmission'

import { EngineError } from '../errors'
import { cavityGeometrySchema, type CavityGeometry } from './geometrySchema'
import { gParameters } from './gParameters'
import { gouyPhaseOneWay } from './gouyPhaseOneWay'
import { eigenmodeWaist } from './eigenmodeWaist'
import { mirrorSpotRadii } from './mirrorSpotRadii'
import { freeSpectralRangeHz } from './freeSpectralRangeHz'
import { finesseFromReflectivities } from './finesseFromReflectivities'
import { transverseOffsetFsr } from './transverseOffsetFsr'

/** A pair of transverse orders whose resonances (mod one FSR) are too close to be told apart. */
export interface DegenerateOrders {
  orders: [number, number]
  /** Distance between the two offsets on the FSR circle, in FSR units (0 … 0.5). */
  separationFsr: number
}

/** Everything the cavity geometry predicts about the swept-cavity spectrum. */
export interface CavityModel {
  geometry: CavityGeometry
  g1: number
  g2: number
  /** Always true: unstable geometry throws `unstable_cavity` instead of returning. */
  stable: boolean
  /** c / 2L for a linear two-mirror cavity. */
  fsrHz: number
  /** One-way Gouy phase ψ, rad, 0 < ψ < π. */
  gouyOneWayRad: number
  waist: { radiusM: number; positionFromMirror1M: number }
  rayleighRangeM: number
  spotRadiusM: { mirror1: number; mirror2: number }
  /** π (R1R2)^(1/4) / (1 − √(R1R2)) when both reflectivities are given, else null. */
  designFinesse: number | null
  /** fsrHz / designFinesse, or null. */
  designLinewidthHz: number | null
  degenerateOrders: DegenerateOrders[]
}

export interface CavityModelOptions {
  /** Highest transverse order N checked for degeneracies. @default 8 */
  maxOrder?: number
  /** Linewidth in FSR units used for the degeneracy test. @default 1/designFinesse, or 1/100 without reflectivities */
  linewidthFsr?: number
  /** Offsets closer than this many linewidths count as degenerate. @default 3 */
  degeneracyLinewidths?: number
}

/** Fallback linewidth (FSR units) when no reflectivities are known: a modest finesse of 100 (common practice). */
const DEFAULT_LINEWIDTH_FSR = 1 / 100

/**
 * Predicts the cavity's g-parameters, FSR, Gouy phase, eigenmode and degenerate transverse orders from its geometry.
 * Source: Kogelnik & Li, Appl. Opt. 5, 1550 (1966); Siegman, "Lasers" (1986), ch. 19.
 * Throws `invalid_geometry` for input the schema refuses and `unstable_cavity` outside 0 < g1 g2 < 1.
 */
export function computeCavityModel(geometry: CavityGeometry, options: CavityModelOptions = {}): CavityModel {
  const parsed = cavityGeometrySchema.safeParse(geometry)
  if (!parsed.success) {
    const issue = parsed.error.issues[0]
    throw new EngineError('invalid_geometry', `Invalid cavity geometry: ${issue.message}`, {
      field: issue.path.join('.'),
    })
  }
  const valid = parsed.data
  const lengthM = valid.lengthMm * 1e-3
  const wavelengthM = valid.wavelengthNm * 1e-9
  const { g1, g2 } = gParameters(lengthM, mmToM(valid.roc1Mm), mmToM(valid.roc2Mm))
  const gouyOneWayRad = gouyPhaseOneWay(g1, g2)
  const waist = eigenmodeWaist(lengthM, wavelengthM, g1, g2)
  const spots = mirrorSpotRadii(lengthM, wavelengthM, g1, g2)
  const fsrHz = freeSpectralRangeHz(lengthM)
  const designFinesse =
    valid.reflectivity1 !== undefined && valid.reflectivity2 !== undefined
      ? finesseFromReflectivities(valid.reflectivity1, valid.reflectivity2)
      : null
  const designLinewidthHz = designFinesse === null ? null : fsrHz / designFinesse

  const {
    maxOrder = 8,
    linewidthFsr = designFinesse === null ? DEFAULT_LINEWIDTH_FSR : 1 / designFinesse,
    degeneracyLinewidths = 3,
  } = options
  assertOption(Number.isInteger(maxOrder) && maxOrder >= 0 && maxOrder <= 1000, 'maxOrder must be an integer from 0 to 1000')
  assertOption(Number.isFinite(linewidthFsr) && linewidthFsr > 0, 'linewidthFsr must be a positive number')
  assertOption(
    Number.isFinite(degeneracyLinewidths) && degeneracyLinewidths >= 0,
    'degeneracyLinewidths must be a non-negative number',
  )

  return {
    geometry: valid,
    g1,
    g2,
    stable: true,
    fsrHz,
    gouyOneWayRad,
    waist: { radiusM: waist.radiusM, positionFromMirror1M: waist.positionFromMirror1M },
    rayleighRangeM: waist.rayleighRangeM,
    spotRadiusM: spots,
    designFinesse,
    designLinewidthHz,
    degenerateOrders: findDegenerateOrders(gouyOneWayRad, maxOrder, linewidthFsr * degeneracyLinewidths),
  }
}

function findDegenerateOrders(gouyOneWayRad: number, maxOrder: number, thresholdFsr: number): DegenerateOrders[] {
  const offsets: number[] = []
  for (let order = 0; order <= maxOrder; order++) offsets.push(transverseOffsetFsr(order, gouyOneWayRad))
  const found: DegenerateOrders[] = []
  for (let a = 0; a <= maxOrder; a++) {
    for (let b = a + 1; b <= maxOrder; b++) {
      const direct = Math.abs(offsets[a] - offsets[b])
      // Offsets live on a circle of circumference 1 FSR: 0.99 and 0.01 are 0.02 apart.
      const separationFsr = Math.min(direct, 1 - direct)
      if (separationFsr <= thresholdFsr) found.push({ orders: [a, b], separationFsr })
    }
  }
  return found
}

function mmToM(valueMm: number | null): number | null {
  return valueMm === null ? null : valueMm * 1e-3
}

function assertOption(condition: boolean, message: string): void {
  if (!condition) throw new EngineError('invalid_argument', message)
}

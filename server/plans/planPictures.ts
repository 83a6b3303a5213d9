/**
 * The planner's pictures as small JSON: the beam radius along the path through the chosen lenses (with the
 * cavity eigenmode inside the cavity), and the coupling map over the positions of a two-lens arrangement.
 * The engine computes; this only samples, rounds and drops what the chart cannot use.
 */
import { beamRadiusAlongPath, couplingMap, type Beam, type MatchingPath } from '../../shared/beam'
import type { BeamPathPicture, CouplingMapPicture, PlacedKitLens, PlannerTable } from '../../shared/api/plannerSchemas'

/** Six significant digits: far below what a chart or a table shows, and half the bytes. */
export const round6 = (value: number): number => (Number.isFinite(value) ? Number(value.toPrecision(6)) : value)
const rounded = (values: ArrayLike<number>): number[] => Array.from(values, round6)

const PATH_POINTS = 300
const CAVITY_POINTS = 60
/** Cells per map axis at most (the map is at most 100 × 100). */
const MAP_CELLS = 100

export interface CavityModeOnPath {
  beam: Beam
  fromMm: number
  toMm: number
}

export function beamPathPicture(path: MatchingPath, cavityMode: CavityModeOnPath, lenses: PlacedKitLens[], arrangementIndex = 0): BeamPathPicture {
  const curve = beamRadiusAlongPath(path.beam, lenses, 0, cavityMode.toMm, PATH_POINTS)
  const mode = beamRadiusAlongPath(cavityMode.beam, [], cavityMode.fromMm, cavityMode.toMm, CAVITY_POINTS)
  return {
    arrangementIndex,
    lenses,
    zMm: rounded(curve.zMm),
    radiusXMm: rounded(curve.radiusXMm),
    radiusYMm: rounded(curve.radiusYMm),
    cavity: { fromMm: round6(cavityMode.fromMm), toMm: round6(cavityMode.toMm), zMm: rounded(mode.zMm), radiusMm: rounded(mode.radiusXMm) },
  }
}

/**
 * Coupling over both lens positions across the lens zones (cells outside every zone, or closer than the minimum
 * spacing, are null: no lens can stand there). The grid is at most MAP_CELLS per axis, never finer than the search.
 */
export function couplingMapPicture(path: MatchingPath, lenses: PlacedKitLens[], arrangementIndex: number, table: PlannerTable): CouplingMapPicture {
  const [lensA, lensB] = lenses
  const from = Math.min(...table.lensZonesMm.map(([a]) => a))
  const to = Math.max(...table.lensZonesMm.map(([, b]) => b))
  const stepMm = Math.max(table.positionStepMm, (to - from) / (MAP_CELLS - 1))
  const map = couplingMap(path, lensA, lensB, { aMm: [from, to], bMm: [from, to] }, stepMm, { minSpacingMm: table.minSpacingMm })
  const inZone = (z: number) => table.lensZonesMm.some(([a, b]) => z >= a - 1e-9 && z <= b + 1e-9) && z >= table.minSpacingMm && z <= table.laserToCavityMm - table.minSpacingMm
  const aOk = Array.from(map.aZMm, inZone)
  const bOk = Array.from(map.bZMm, inZone)
  const coupling: (number | null)[] = new Array(map.coupling.length)
  const best = { aZMm: NaN, bZMm: NaN, coupling: -1 }
  for (let i = 0; i < map.aZMm.length; i++) {
    for (let j = 0; j < map.bZMm.length; j++) {
      const k = i * map.bZMm.length + j
      const value = map.coupling[k]
      const usable = aOk[i] && bOk[j] && Number.isFinite(value)
      coupling[k] = usable ? round6(value) : null
      if (usable && value > best.coupling) Object.assign(best, { aZMm: map.aZMm[i], bZMm: map.bZMm[j], coupling: value })
    }
  }
  return {
    arrangementIndex,
    lensA,
    lensB,
    aZMm: rounded(map.aZMm),
    bZMm: rounded(map.bZMm),
    coupling,
    best: { aZMm: round6(best.aZMm), bZMm: round6(best.bZMm), coupling: round6(best.coupling) },
  }
}

import type { CavityGeometry } from '../cavity'
import { EngineError, type EngineWarning } from '../errors'
import { assertArgument, assertBeam, assertFiniteNumber, assertNonNegative, assertPositive } from './assertions'
import { cavityEigenmodeBeam, type CavityEigenmodeBeam, type InputSubstrate } from './cavityEigenmodeBeam'
import { idealSingleLens, type IdealSingleLens } from './idealSingleLens'
import { idealTwoLens, type IdealTwoLens } from './idealTwoLens'
import { lensPositionTolerance, type ArrangementTolerance } from './lensPositionTolerance'
import { searchKitArrangements, type KitCandidate } from './searchKitArrangements'
import type { Beam, KitLens, MatchingPath, PlacedLens } from './types'

/** Where lenses may stand on the table. All distances in mm along the beam from the beam's reference plane. */
export interface TableConstraints {
  /** Distance from the beam's reference plane (z = 0) to the cavity entrance (mirror 1), mm. */
  laserToCavityMm: number
  /** Allowed [from, to] intervals for lenses, mm. */
  lensZonesMm: [number, number][]
  /** Smallest distance between two lenses, and from a lens to either end of the path, mm. @default 0 */
  minSpacingMm?: number
  /** Grid of lens positions, mm. @default 1 */
  positionStepMm?: number
}

export interface ModeMatchingProblem {
  cavity: CavityGeometry
  beam: Beam
  kit: KitLens[]
  table: TableConstraints
}

export interface ModeMatchingOptions {
  /** Coupling the lab wants; the verdict says whether the kit reaches it. @default 0.95 */
  couplingTarget?: number
  /** Number of kit arrangements returned. @default 10 */
  maxArrangements?: number
  /** Lens position tolerance for the ±mm losses, mm. @default 1 */
  toleranceMm?: number
  /**
   * `robust`: best coupling still reached with every lens off by up to ±toleranceMm first (ties: higher coupling);
   * `coupling`: highest coupling first.
   * @default 'robust'
   */
  rankBy?: 'robust' | 'coupling'
  /** Mirror-1 substrate; see `cavityEigenmodeBeam`. @default null (ignored) */
  inputSubstrate?: InputSubstrate | null
  /** A waist radius larger than this is refused (optics on the table cannot pass it), mm. @default 12.5 */
  maxBeamRadiusMm?: number
  /** Focal-length range for the ideal (buy-this) solutions, mm. @default [10, 2000] */
  idealFocalRangeMm?: [number, number]
  /** How many ideal two-lens solutions to return. @default 5 */
  idealCount?: number
  /**
   * Largest search accepted, in two-lens placements weighed ((lenses × positions)² / 2, an upper bound); a larger
   * one is refused with the position step that would fit. @default Infinity
   */
  maxTwoLensPlacements?: number
  /** Asked between first lenses of the two-lens search; true stops it there (a time budget). @default never */
  shouldStop?: () => boolean
}

export interface Arrangement {
  kind: 'one-lens' | 'two-lens'
  /** The kit lenses in path order with their positions. */
  lenses: PlacedLens[]
  coupling: number
  tolerance: ArrangementTolerance
}

export interface ModeMatchingPlan {
  /** The cavity eigenmode as the target, seen from outside mirror 1. */
  target: CavityEigenmodeBeam
  /** Beam, target and cavity plane: pass to `couplingMap` and `pathCoupling`. */
  path: MatchingPath
  /** The cavity eigenmode inside the cavity in path coordinates (draw it with `beamRadiusAlongPath`). */
  cavityMode: { beam: Beam; fromMm: number; toMm: number }
  /** Kit arrangements, best first (see `rankBy`). */
  arrangements: Arrangement[]
  /** Ideal lenses with free focal lengths (what to buy). */
  ideal: { singleLens: IdealSingleLens | null; twoLens: IdealTwoLens[] }
  couplingTarget: number
  /** Whether any kit arrangement reaches the target. */
  reachesTarget: boolean
  /** One or two plain sentences: the answer. */
  verdict: string
  evaluated: { oneLens: number; twoLens: number; positions: number }
  /** Null when the search was complete; otherwise a sentence saying where `shouldStop` cut it. */
  cut: string | null
  warnings: EngineWarning[]
}

/**
 * Mode-matching planner: one- and two-lens arrangements from the lab's kit that put the input beam into the cavity
 * eigenmode within the table's limits, ranked by coupling and mount tolerance, plus the ideal free-focal-length
 * solutions and a plain verdict. Physics: ABCD propagation of q and the Gaussian overlap (Kogelnik & Li, Appl. Opt.
 * 5, 1550 (1966); Siegman, "Lasers" (1986), ch. 20); the search itself is exhaustive on the position grid.
 */
export function planModeMatching(problem: ModeMatchingProblem, options: ModeMatchingOptions = {}): ModeMatchingPlan {
  const {
    couplingTarget = 0.95,
    maxArrangements = 10,
    toleranceMm = 1,
    rankBy = 'robust',
    inputSubstrate = null,
    maxBeamRadiusMm = 12.5,
    idealFocalRangeMm = [10, 2000],
    idealCount = 5,
    maxTwoLensPlacements = Infinity,
    shouldStop,
  } = options
  assertArgument(Number.isFinite(couplingTarget) && couplingTarget > 0 && couplingTarget <= 1, `couplingTarget must be a fraction in (0, 1], got ${couplingTarget}`)
  assertArgument(Number.isInteger(maxArrangements) && maxArrangements >= 1, 'maxArrangements must be a positive integer')
  assertPositive(toleranceMm, 'toleranceMm')
  assertArgument(rankBy === 'robust' || rankBy === 'coupling', "rankBy must be 'robust' or 'coupling'")
  if (typeof problem !== 'object' || problem === null) throw new EngineError('invalid_argument', 'The planning problem must be an object with cavity, beam, kit and table')
  const { beam, kit, table } = problem
  assertBeam(beam)
  const target = cavityEigenmodeBeam(problem.cavity, { inputSubstrate })
  if (Math.abs(beam.wavelengthNm - target.wavelengthNm) > 1e-6 * target.wavelengthNm) {
    throw new EngineError('wavelength_mismatch', `The beam is at ${beam.wavelengthNm} nm but the cavity is set up for ${target.wavelengthNm} nm; use one wavelength for both`)
  }
  for (const [axis, name] of [[beam.x, 'x'], [beam.y, 'y']] as const) {
    if (axis.waistRadiusMm > maxBeamRadiusMm) {
      throw new EngineError('beam_too_large', `The beam's ${name} waist radius (${axis.waistRadiusMm} mm) is larger than the table's optics allow (${maxBeamRadiusMm} mm); check the units (mm) or raise maxBeamRadiusMm`)
    }
  }
  const { laserToCavityMm, minSpacingMm, positions, intervals } = checkTable(table)
  const lenses = checkKit(kit)
  checkSearchSize(lenses.length, positions.length, intervals, maxTwoLensPlacements)
  const path: MatchingPath = { beam, target, cavityPlaneMm: laserToCavityMm }

  const powers = Float64Array.from(lenses, (l) => 1 / l.focalLengthMm)
  const counts = Int32Array.from(lenses, (l) => l.count)
  const search = searchKitArrangements(path, powers, counts, positions, minSpacingMm, shouldStop)
  const cut =
    search.firstLensesSearched < lenses.length
      ? `The search was cut short by its time budget: two-lens pairs were searched for ${search.firstLensesSearched} of ${lenses.length} first lenses (every one-lens placement was); a coarser positionStepMm or fewer lenses gives a complete answer.`
      : null
  const place = (c: KitCandidate): PlacedLens[] =>
    c.lensIndices.map((index, k) => ({ id: lenses[index].id, focalLengthMm: lenses[index].focalLengthMm, zMm: c.zMm[k] }))
  const pool = [...search.single, ...search.pairs].sort((a, b) => b.coupling - a.coupling).slice(0, Math.max(50, 5 * maxArrangements))
  const arrangements: Arrangement[] = pool.map((c) => ({
    kind: c.lensIndices.length === 1 ? 'one-lens' : 'two-lens',
    lenses: place(c),
    coupling: c.coupling,
    tolerance: lensPositionTolerance(path, place(c), toleranceMm),
  }))
  arrangements.sort((a, b) =>
    rankBy === 'robust' ? b.tolerance.worstCoupling - a.tolerance.worstCoupling || b.coupling - a.coupling : b.coupling - a.coupling,
  )
  const chosen = arrangements.slice(0, maxArrangements)

  const idealStep = Math.max(table.positionStepMm ?? 1, (intervals.reduce((s, [a, b]) => s + (b - a), 0)) / 120)
  const idealGrid = gridOf(intervals, idealStep)
  const ideal = {
    singleLens: idealSingleLens(path, intervals),
    twoLens: idealTwoLens(path, idealGrid, minSpacingMm, {
      minFocalLengthMm: idealFocalRangeMm[0],
      maxFocalLengthMm: idealFocalRangeMm[1],
      toleranceMm,
      count: idealCount,
    }),
  }
  const bestCoupling = arrangements.reduce((m, a) => Math.max(m, a.coupling), 0)
  const reachesTarget = bestCoupling >= couplingTarget
  const warnings = planWarnings(beam, ideal)
  return {
    target,
    path,
    cavityMode: {
      beam: {
        wavelengthNm: target.wavelengthNm,
        x: { waistRadiusMm: target.insideWaistRadiusMm, waistPositionMm: laserToCavityMm + target.substrateThicknessMm + target.insideWaistFromMirror1Mm, m2: 1 },
        y: { waistRadiusMm: target.insideWaistRadiusMm, waistPositionMm: laserToCavityMm + target.substrateThicknessMm + target.insideWaistFromMirror1Mm, m2: 1 },
      },
      fromMm: laserToCavityMm + target.substrateThicknessMm,
      toMm: laserToCavityMm + target.substrateThicknessMm + target.cavityLengthMm,
    },
    arrangements: chosen,
    ideal,
    couplingTarget,
    reachesTarget,
    verdict: verdictOf(arrangements, chosen, couplingTarget, ideal, toleranceMm),
    evaluated: { ...search.evaluated, positions: positions.length },
    cut,
    warnings,
  }
}

function checkTable(table: TableConstraints) {
  if (typeof table !== 'object' || table === null) throw new EngineError('invalid_table', 'table must be an object with laserToCavityMm and lensZonesMm')
  const { laserToCavityMm, lensZonesMm, minSpacingMm = 0, positionStepMm = 1 } = table
  assertFiniteNumber(laserToCavityMm, 'laserToCavityMm')
  if (laserToCavityMm <= 0) throw new EngineError('invalid_table', `laserToCavityMm must be a positive distance in mm, got ${laserToCavityMm}`)
  assertNonNegative(minSpacingMm, 'minSpacingMm')
  assertPositive(positionStepMm, 'positionStepMm')
  if (!Array.isArray(lensZonesMm) || lensZonesMm.length === 0) throw new EngineError('invalid_table', 'lensZonesMm must list at least one [from, to] interval where lenses may stand')
  const intervals: [number, number][] = []
  lensZonesMm.forEach((zone, i) => {
    if (!Array.isArray(zone) || zone.length !== 2 || !zone.every((v) => typeof v === 'number' && Number.isFinite(v))) {
      throw new EngineError('invalid_table', `lensZonesMm[${i}] must be [from, to] in mm`)
    }
    const [from, to] = zone
    if (from < 0 || to > laserToCavityMm || to < from) {
      const where = to < from ? `ends (${to} mm) before it starts (${from} mm)` : `(${from}–${to} mm) reaches outside the path`
      throw new EngineError('zone_outside_path', `Lens zone ${i + 1} ${where}: a zone must lie between the laser (0 mm) and the cavity (${laserToCavityMm} mm).`)
    }
    // Keep the minimum spacing from both ends of the path.
    const lo = Math.max(from, minSpacingMm)
    const hi = Math.min(to, laserToCavityMm - minSpacingMm)
    if (hi >= lo) intervals.push([lo, hi])
  })
  const positions = gridOf(intervals, positionStepMm)
  if (positions.length === 0) {
    throw new EngineError('no_room_for_lenses', `No lens position is left in the zones once lenses keep ${minSpacingMm} mm from the laser and the cavity`)
  }
  if (positions.length > 20000) {
    throw new EngineError('grid_too_fine', `The zones with positionStepMm = ${positionStepMm} give ${positions.length} positions; use at most 20000 (a coarser step)`)
  }
  return { laserToCavityMm, minSpacingMm, positionStepMm, positions, intervals }
}

/**
 * Refuse a search larger than `maxPlacements` two-lens placements, naming the position step that would fit (the
 * work grows with the square of lenses × positions).
 */
function checkSearchSize(lensCount: number, positionCount: number, intervals: [number, number][], maxPlacements: number) {
  const placements = (lensCount * positionCount) ** 2 / 2
  if (placements <= maxPlacements) return
  const fittingPositions = Math.floor(Math.sqrt(2 * maxPlacements) / lensCount)
  const zoneLengthMm = intervals.reduce((sum, [from, to]) => sum + (to - from), 0)
  let stepMm = Math.ceil((10 * zoneLengthMm) / Math.max(1, fittingPositions - intervals.length)) / 10
  while (gridOf(intervals, stepMm).length > fittingPositions && stepMm < zoneLengthMm) stepMm = Math.round((stepMm + 0.1) * 10) / 10
  const fewerLenses = Math.max(1, Math.floor(Math.sqrt(2 * maxPlacements) / positionCount))
  throw new EngineError(
    'search_too_large',
    `This search would weigh about ${fmt(placements)} two-lens placements (${lensCount} lenses × ${positionCount} positions, squared); the limit is ${fmt(maxPlacements)}. ` +
      `Coarsen positionStepMm to ${stepMm} mm or more, narrow lensZonesMm, or plan with at most ${fewerLenses} lenses (lensIds).`,
  )
}

function fmt(n: number): string {
  return Math.round(n).toLocaleString('en-US')
}

/** Sorted, de-duplicated grid over the intervals (each from its own start, at the step). */
function gridOf(intervals: [number, number][], stepMm: number): Float64Array {
  const values: number[] = []
  for (const [from, to] of intervals) {
    const count = Math.floor((to - from) / stepMm + 1e-9) + 1
    if (count > 1e6) throw new EngineError('grid_too_fine', 'The lens position grid is too fine; use a coarser positionStepMm')
    for (let k = 0; k < count; k++) values.push(from + k * stepMm)
  }
  values.sort((a, b) => a - b)
  const unique = values.filter((v, i) => i === 0 || v - values[i - 1] > 1e-9)
  return Float64Array.from(unique)
}

function checkKit(kit: KitLens[]): KitLens[] {
  if (!Array.isArray(kit) || kit.length === 0) throw new EngineError('empty_kit', 'The lens kit is empty; add the lenses the lab has (focal length and count) before planning')
  const ids = new Set<string>()
  kit.forEach((lens, i) => {
    if (typeof lens?.id !== 'string' || lens.id === '') throw new EngineError('invalid_kit', `kit[${i}].id must be a non-empty string`)
    if (ids.has(lens.id)) throw new EngineError('invalid_kit', `kit[${i}].id "${lens.id}" appears twice; ids must be unique`)
    ids.add(lens.id)
    if (typeof lens.focalLengthMm !== 'number' || !Number.isFinite(lens.focalLengthMm) || Math.abs(lens.focalLengthMm) < 1) {
      throw new EngineError('invalid_kit', `kit[${i}] ("${lens.id}"): focalLengthMm must be a finite number of millimetres with |f| ≥ 1 mm, got ${String(lens.focalLengthMm)}`)
    }
    if (!Number.isInteger(lens.count) || lens.count < 0) throw new EngineError('invalid_kit', `kit[${i}] ("${lens.id}"): count must be a whole number ≥ 0, got ${String(lens.count)}`)
  })
  const available = kit.filter((lens) => lens.count > 0)
  if (available.length === 0) throw new EngineError('empty_kit', 'Every lens in the kit has count 0; there is nothing to plan with')
  return available
}

function planWarnings(beam: Beam, ideal: ModeMatchingPlan['ideal']): EngineWarning[] {
  const warnings: EngineWarning[] = []
  const worstM2 = Math.max(beam.x.m2, beam.y.m2)
  if (worstM2 > 1.05) {
    warnings.push({
      code: 'beam_quality',
      message: `The beam has M² = ${worstM2.toFixed(2)}: the couplings are for its embedded Gaussian (waist / M); a real beam with M² > 1 carries higher-order content, so expect less in TEM00 than shown.`,
    })
  }
  const bestIdeal = Math.max(ideal.singleLens?.coupling ?? 0, ...ideal.twoLens.map((s) => s.coupling))
  const astigmatic = beam.x.waistRadiusMm !== beam.y.waistRadiusMm || beam.x.waistPositionMm !== beam.y.waistPositionMm || beam.x.m2 !== beam.y.m2
  if (astigmatic && bestIdeal < 0.999) {
    warnings.push({
      code: 'astigmatic_beam',
      message: `The beam's x and y axes differ; spherical lenses cannot match both, and even ideal ones reach only ${pct(bestIdeal)}. Cylindrical lenses or an anamorphic pair would do better.`,
    })
  }
  return warnings
}

function verdictOf(all: Arrangement[], chosen: Arrangement[], targetCoupling: number, ideal: ModeMatchingPlan['ideal'], toleranceMm: number): string {
  const idealText = ideal.twoLens.length > 0
    ? ` Ideal lenses: ${describe(ideal.twoLens[0].lenses)} reach ${pct(ideal.twoLens[0].coupling)}.`
    : ideal.singleLens !== null
      ? ` The best single ideal lens (${describe([ideal.singleLens.lens])}) reaches ${pct(ideal.singleLens.coupling)}.`
      : ''
  if (chosen.length === 0) return `No arrangement of the kit fits on the table.${idealText}`
  const best = all.reduce((m, a) => (a.coupling > m.coupling ? a : m), all[0])
  const reaching = all.filter((a) => a.coupling >= targetCoupling).length
  if (reaching === 0) {
    return `Nothing in the kit reaches the ${pct(targetCoupling)} target: the best arrangement, ${describe(best.lenses)}, couples ${pct(best.coupling)}.${idealText}`
  }
  const top = chosen[0]
  return `${reaching} arrangement${reaching === 1 ? '' : 's'} from the kit reach the ${pct(targetCoupling)} target. Suggested: ${describe(top.lenses)}, coupling ${pct(top.coupling)}, at least ${pct(top.tolerance.worstCoupling)} with each lens within ±${toleranceMm} mm.`
}

function describe(lenses: { zMm: number; focalLengthMm: number; id?: string }[]): string {
  return lenses
    .map((l) => `${l.id !== undefined ? `${l.id} ` : ''}f = ${Number(l.focalLengthMm.toPrecision(4))} mm at ${Number(l.zMm.toFixed(1))} mm`)
    .join(', then ')
}

function pct(fraction: number): string {
  return `${(100 * fraction).toFixed(fraction > 0.999 && fraction < 1 ? 2 : 1)} %`
}

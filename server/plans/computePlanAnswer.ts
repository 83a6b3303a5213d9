/**
 * The planner's answer from a cavity, the usable kit lenses and a request: the engine's plan shaped for the API, with
 * the pictures. No database and no Express, so it runs in a worker thread (see planThread.ts). Throws EngineError for
 * what the optics refuse and HttpError for a bad picture choice.
 */
import { createInputBeam, planModeMatching, type Arrangement, type KitLens } from '../../shared/beam'
import type { Lens, ParsedPlanRequest, PlacedKitLens, PlanAnswer, PlannerBeam } from '../../shared/api/plannerSchemas'
import type { CavityGeometry } from '../../shared/cavity'
import { HttpError } from '../http/errors'
import { beamPathPicture, couplingMapPicture, round6 } from './planPictures'

export interface PlanComputation {
  cavity: { id: string; name: string; wavelengthNm: number }
  geometry: CavityGeometry
  /** Kit lenses the planner may use (see `usableKit`), and those left out with the reason. */
  used: Lens[]
  left: { label: string; reason: string }[]
  request: ParsedPlanRequest
  /** The work allowed (PLANNER_MAX_PLACEMENTS, PLANNER_TIME_BUDGET_SECONDS); none when absent (the demo seed). */
  limits?: PlanLimits
}

export interface PlanLimits {
  maxTwoLensPlacements: number
  timeBudgetMs: number
}

/** The beam the request describes, at the cavity's wavelength unless it names its own. */
export function resolveBeam(spec: PlannerBeam, wavelengthNm: number) {
  return createInputBeam({ ...spec, wavelengthNm: spec.wavelengthNm ?? wavelengthNm })
}

const placed = (byLabel: Map<string, Lens>) => (lens: { id?: string; focalLengthMm: number; zMm: number }): PlacedKitLens => {
  const kit = lens.id === undefined ? undefined : byLabel.get(lens.id)
  return { lensId: kit?.id ?? null, label: kit?.label ?? `f = ${round6(lens.focalLengthMm)} mm`, type: kit?.type ?? null, focalLengthMm: lens.focalLengthMm, zMm: round6(lens.zMm) }
}

export function computePlanAnswer(computation: PlanComputation): PlanAnswer {
  const started = performance.now()
  const { cavity, geometry, used, left, request, limits } = computation
  const deadline = limits ? started + limits.timeBudgetMs : Infinity
  const input = resolveBeam(request.beam, cavity.wavelengthNm)
  const kit: KitLens[] = used.map((lens) => ({ id: lens.label, focalLengthMm: lens.focalLengthMm, count: lens.count }))
  const plan = planModeMatching(
    { cavity: geometry, beam: input.beam, kit, table: request.table },
    {
      couplingTarget: request.couplingTarget,
      rankBy: request.rankBy,
      toleranceMm: request.toleranceMm,
      maxTwoLensPlacements: limits?.maxTwoLensPlacements,
      shouldStop: () => performance.now() > deadline,
    },
  )
  const byLabel = new Map(used.map((lens) => [lens.label, lens]))
  const toPlaced = placed(byLabel)
  const arrangements = plan.arrangements.map((a: Arrangement) => ({ kind: a.kind, lenses: a.lenses.map(toPlaced), coupling: a.coupling, tolerance: a.tolerance }))
  const pathIndex = request.pathArrangement ?? 0
  if (request.pathArrangement !== undefined && !arrangements[pathIndex]) {
    throw new HttpError(422, 'no_such_arrangement', `The plan has ${arrangements.length} arrangements; pathArrangement ${pathIndex} is not one of them.`)
  }
  const pathLenses = arrangements[pathIndex]?.lenses ?? []
  const mapIndex = request.mapArrangement ?? arrangements.findIndex((a) => a.kind === 'two-lens')
  const mapArrangement = arrangements[mapIndex]
  if (request.mapArrangement !== undefined && mapArrangement?.kind !== 'two-lens') {
    throw new HttpError(422, 'not_two_lens', `Arrangement ${request.mapArrangement} is not a two-lens arrangement; the coupling map needs two lenses.`)
  }
  const fitSummary = (fit: NonNullable<typeof input.fits>['x']) => ({
    waistRadiusMm: fit.waistRadiusMm,
    waistPositionMm: fit.waistPositionMm,
    m2: fit.m2,
    rayleighRangeMm: fit.rayleighRangeMm,
    uncertainty: fit.uncertainty,
    residualsMm: fit.residualsMm,
    reducedChiSquare: fit.reducedChiSquare,
    uncertaintySource: fit.uncertaintySource,
  })
  const { target } = plan
  return {
    cavity: { id: cavity.id, name: cavity.name, wavelengthNm: cavity.wavelengthNm },
    beam: input.beam,
    fits: input.fits ? { x: fitSummary(input.fits.x), y: fitSummary(input.fits.y) } : null,
    target: {
      waistRadiusMm: target.waistRadiusMm,
      waistFromEntranceMm: target.waistFromEntranceMm,
      rayleighRangeMm: target.rayleighRangeMm,
      insideWaistRadiusMm: target.insideWaistRadiusMm,
      insideWaistFromMirror1Mm: target.insideWaistFromMirror1Mm,
    },
    kit: { used: used.length, left },
    arrangements,
    ideal: {
      singleLens: plan.ideal.singleLens ? { ...plan.ideal.singleLens.lens, coupling: plan.ideal.singleLens.coupling } : null,
      twoLens: plan.ideal.twoLens.map((s) => ({ lenses: s.lenses.map((l) => ({ focalLengthMm: l.focalLengthMm, zMm: l.zMm })), coupling: s.coupling, worstCoupling: s.worstCoupling })),
    },
    couplingTarget: plan.couplingTarget,
    reachesTarget: plan.reachesTarget,
    verdict: plan.verdict,
    evaluated: plan.evaluated,
    cut: plan.cut,
    warnings: [...input.warnings, ...plan.warnings],
    pictures: {
      path: pathLenses.length > 0 ? beamPathPicture(plan.path, plan.cavityMode, pathLenses, pathIndex) : null,
      map: mapArrangement?.kind === 'two-lens' ? couplingMapPicture(plan.path, mapArrangement.lenses, mapIndex, request.table) : null,
    },
    computeMs: Math.round(performance.now() - started),
  }
}

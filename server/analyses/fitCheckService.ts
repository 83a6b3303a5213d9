/** The fit check of one analysis: its figures against the cavity's geometry and its usual values. */
import type { FitCheck } from '../../shared/api/correctionSchemas'
import { computeCavityModel } from '../../shared/cavity'
import { geometryOf, getCavity, listCavities } from '../cavities/cavityService'
import type { Db } from '../db/knex'
import { HttpError } from '../http/errors'
import { getAnalysis } from './analysisService'
import { judgeFit } from './judgeFit'

/** How many of the cavity's recent analyses set its usual figures. */
const HISTORY_COUNT = 30

const median = (values: number[]) => {
  if (values.length === 0) return null
  const sorted = [...values].sort((a, b) => a - b)
  const mid = Math.floor(sorted.length / 2)
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2
}

export async function checkFit(db: Db, analysisId: string): Promise<FitCheck> {
  const analysis = await getAnalysis(db, analysisId)
  const result = analysis.result
  if (analysis.status !== 'done' || !result) throw new HttpError(409, 'analysis_not_done', `Analysis ${analysisId} is ${analysis.status}; only a finished analysis can be checked.`)
  const cavity = await getCavity(db, analysis.cavityId)
  const history = (await db('analyses')
    .where({ cavity_id: cavity.id, status: 'done' })
    .whereNot({ id: analysis.id })
    .whereNull('deleted_at')
    .whereNull('excluded_at')
    .orderBy('created_at', 'desc')
    .limit(HISTORY_COUNT)
    .select(
      'linewidth_hz',
      db.raw(`(result -> 'fsr' ->> 'seconds')::float8 / nullif((result -> 'sweep' ->> 'endTime')::float8 - (result -> 'sweep' ->> 'startTime')::float8, 0) as fsr_to_sweep`),
    )) as Array<{ linewidth_hz: number | null; fsr_to_sweep: number | null }>
  const others = (await listCavities(db))
    .filter((other) => other.id !== cavity.id)
    .map((other) => ({ cavityId: other.id, name: other.name, gouyOneWayRad: computeCavityModel(geometryOf(other)).gouyOneWayRad }))
  const sweepSeconds = result.sweep.endTime - result.sweep.startTime
  const verdict = judgeFit({
    cavityName: cavity.name,
    measuredGouyRad: result.gouy.measuredOneWayRad,
    predictedGouyRad: computeCavityModel(geometryOf(cavity)).gouyOneWayRad,
    geometryWarning: result.warnings.some((w) => w.code === 'geometry_mismatch'),
    fsrToSweep: result.fsr.seconds !== null && sweepSeconds > 0 ? result.fsr.seconds / sweepSeconds : null,
    usualFsrToSweep: median(history.map((row) => row.fsr_to_sweep).filter((v): v is number => v !== null && Number.isFinite(v))),
    linewidthHz: result.linewidthHz,
    usualLinewidthHz: median(history.map((row) => row.linewidth_hz).filter((v): v is number => v !== null)),
    others,
  })
  return { analysisId: analysis.id, cavityId: cavity.id, cavityName: cavity.name, basedOn: history.length, ...verdict }
}

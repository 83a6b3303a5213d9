/** Two analyses side by side: their figures and b − a. The client overlays the traces itself (in FSR units). */
import type { ComparedAnalysis, Comparison } from '../../shared/api/overviewTypes'
import { findAnalysis } from '../analyses/analysisRepository'
import type { Db } from '../db/knex'
import { HttpError } from '../http/errors'

async function comparedAnalysis(db: Db, id: string): Promise<ComparedAnalysis> {
  const analysis = await findAnalysis(db, id)
  if (!analysis) throw new HttpError(404, 'analysis_not_found', `No analysis with id ${id}.`)
  if (analysis.status !== 'done' || !analysis.result) {
    throw new HttpError(409, 'analysis_not_done', `Analysis ${id} is ${analysis.status}; only finished analyses can be compared.`)
  }
  const context = (await db('traces as t').join('cavities as c', 'c.id', 't.cavity_id').where('t.id', analysis.traceId).first('t.file_name', 't.note', 'c.name')) as
    | { file_name: string; note: string; name: string }
    | undefined
  const { result } = analysis
  return {
    analysisId: analysis.id,
    cavityId: analysis.cavityId,
    cavityName: context?.name ?? '',
    traceId: analysis.traceId,
    fileName: context?.file_name ?? '',
    note: context?.note ?? '',
    createdAt: analysis.createdAt,
    fundamentalFraction: result.fundamentalFraction,
    fundamentalFractionError: result.fundamentalFractionError,
    finesse: result.finesse,
    finesseError: result.finesseError,
    shareErrors: Object.fromEntries((result.orderEstimates ?? []).filter((e) => e.shareError !== null).map((e) => [String(e.order), e.shareError as number])),
    linewidthHz: result.linewidthHz,
    fsrHz: result.fsr.hz,
    fsrSeconds: result.fsr.seconds,
    misalignmentShare: result.misalignmentShare,
    mismatchShare: result.mismatchShare,
    orders: result.orders,
    belowNoiseShare: result.belowNoiseShare ?? 0,
  }
}

const minus = (b: number | null, a: number | null) => (a === null || b === null ? null : b - a)
const relative = (b: number | null, a: number | null) => (a === null || b === null || a === 0 ? null : (b - a) / a)

export async function compareAnalyses(db: Db, aId: string, bId: string): Promise<Comparison> {
  const [a, b] = await Promise.all([comparedAnalysis(db, aId), comparedAnalysis(db, bId)])
  const orderKeys = [...new Set([...Object.keys(a.orders), ...Object.keys(b.orders)])].sort((x, y) => Number(x) - Number(y))
  return {
    a,
    b,
    difference: {
      fundamentalFraction: b.fundamentalFraction - a.fundamentalFraction,
      finesse: minus(b.finesse, a.finesse),
      linewidthHz: minus(b.linewidthHz, a.linewidthHz),
      fsrHz: b.fsrHz - a.fsrHz,
      misalignmentShare: b.misalignmentShare - a.misalignmentShare,
      mismatchShare: b.mismatchShare - a.mismatchShare,
      orders: Object.fromEntries(orderKeys.map((key) => [key, (b.orders[key] ?? 0) - (a.orders[key] ?? 0)])),
      belowNoiseShare: b.belowNoiseShare - a.belowNoiseShare,
      relative: { finesse: relative(b.finesse, a.finesse), linewidthHz: relative(b.linewidthHz, a.linewidthHz) },
    },
  }
}

/**
 * Typed calls for the lab's memory: the leads' overview, the comparison of two analyses, and the
 * addresses of the CSV exports (plain links: the browser downloads them with the session cookie).
 */
import type { Comparison, ComparedAnalysis, Overview, OverviewRow, SparkPoint, TargetStatus } from '../../shared/api/overviewTypes'
import { apiRequest } from './client'

export type { Comparison, ComparedAnalysis, Overview, OverviewRow, SparkPoint, TargetStatus }

const enc = encodeURIComponent

/** A date range of the history; either end may be open. ISO 8601 strings. */
export interface HistoryRangeQuery {
  from?: string
  to?: string
  limit?: number
}

function rangeSearch(query: HistoryRangeQuery): string {
  const params = new URLSearchParams()
  if (query.from) params.set('from', query.from)
  if (query.to) params.set('to', query.to)
  if (query.limit !== undefined) params.set('limit', String(query.limit))
  const search = params.toString()
  return search ? `?${search}` : ''
}

/** `GET /api/overview`: every non-archived cavity with its latest figures, 30-day change and alert state. */
export function getOverview(signal?: AbortSignal): Promise<Overview> {
  return apiRequest('/overview', { signal })
}

/** `GET /api/analyses/compare?a&b`: both analyses' figures and b − a. */
export function compareAnalyses(a: string, b: string, signal?: AbortSignal): Promise<Comparison> {
  return apiRequest(`/analyses/compare?a=${enc(a)}&b=${enc(b)}`, { signal })
}

/** Address of the overview as CSV (one line per cavity). */
export function overviewCsvUrl(): string {
  return '/api/overview.csv'
}

/** Address of a cavity's history as CSV, for the same range as the page shows. */
export function historyCsvUrl(cavityId: string, query: HistoryRangeQuery = {}): string {
  return `/api/cavities/${enc(cavityId)}/history.csv${rangeSearch(query)}`
}

/**
 * How far a stored result can be trusted, judged from what the engine already reports (its warnings, its
 * shares). Shared by the server (history rows, alerts) and the client (headline, lists), so a result that
 * one screen greys out is never "met" on another. Pure.
 */

/** Warnings that say the number itself may be wrong, with the one-line reason shown beside it. */
export const underminingWarnings: Readonly<Record<string, string>> = {
  ambiguous_reading: 'another reading of the resonances explains them about as well',
  geometry_mismatch: 'the transverse orders do not stand where the cavity geometry puts them',
  many_unassigned: 'many resonances belong to no order',
}

/** What a trust judgement needs of a result: the TEM00 fraction, warning codes and any shares. */
export interface TrustInput {
  fundamentalFraction: number | null
  warningCodes: readonly string[]
  /** Shares per order (fractions) as stored, reported or estimated; outside 0–1 they undermine the result. */
  shares?: readonly number[]
}

export interface ResultTrust {
  /** True when the result must not be shown or judged as a confident number. */
  doubtful: boolean
  /** The reasons, each a short phrase. */
  reasons: string[]
  /** All reasons in one line, e.g. "In doubt: many resonances belong to no order."; null when trusted. */
  summary: string | null
}

/** A share a little outside 0–1 is rounding; beyond this (a tenth of a point) it is a wrong reading. */
const SHARE_SLACK = 1e-3

export function judgeResultTrust(input: TrustInput): ResultTrust {
  const reasons = Object.entries(underminingWarnings)
    .filter(([code]) => input.warningCodes.includes(code))
    .map(([, reason]) => reason)
  const values = [input.fundamentalFraction, ...(input.shares ?? [])].filter((v): v is number => v !== null && Number.isFinite(v))
  const outside = values.find((v) => v < -SHARE_SLACK || v > 1 + SHARE_SLACK)
  if (outside !== undefined) reasons.push(`a share reads ${(outside * 100).toFixed(1)} %, outside 0–100 %`)
  return { doubtful: reasons.length > 0, reasons, summary: reasons.length ? `In doubt: ${reasons.join('; ')}.` : null }
}

/** A result as the engine stores it, reduced to what `judgeResultTrust` reads. */
export function trustInputOf(result: {
  fundamentalFraction: number
  warnings: ReadonlyArray<{ code: string }>
  orders?: Record<string, number>
  orderEstimates?: ReadonlyArray<{ share: number }>
}): TrustInput {
  return {
    fundamentalFraction: result.fundamentalFraction,
    warningCodes: result.warnings.map((w) => w.code),
    shares: [...Object.values(result.orders ?? {}), ...(result.orderEstimates ?? []).map((e) => e.share)],
  }
}

/** A fraction clamped to 0–1 for display, with the raw value kept for the detail. */
export function clampShare(raw: number): { shown: number; raw: number; clamped: boolean } {
  const shown = Math.min(1, Math.max(0, raw))
  return { shown, raw, clamped: shown !== raw }
}

/**
 * Power the shares leave out: the area of the unassigned resonances over the area of every resonance listed
 * (carriers, sidebands, unassigned), and the TEM00 fraction against that whole area. The engine's shares are of
 * the carrier power only, so a trace with many unassigned peaks must say how much they hold.
 */
export function unassignedPower(result: { fundamentalFraction: number; peaks: ReadonlyArray<{ kind: string; area: number }> }): {
  unassignedShare: number
  fundamentalOfAll: number
  unassignedCount: number
} {
  let all = 0
  let unassigned = 0
  let carrier = 0
  let unassignedCount = 0
  for (const peak of result.peaks) {
    const area = Math.max(0, peak.area)
    all += area
    if (peak.kind === 'unassigned') {
      unassigned += area
      unassignedCount += 1
    } else if (peak.kind === 'carrier') carrier += area
  }
  const unassignedShare = all > 0 ? unassigned / all : 0
  return { unassignedShare, fundamentalOfAll: all > 0 ? (result.fundamentalFraction * carrier) / all : result.fundamentalFraction, unassignedCount }
}

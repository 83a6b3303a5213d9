/**
 * Does one analysis breach its cavity's rules? Pure: the figures, the settings and the cavity's recent
 * median finesse in, a verdict per rule out ('off' when the rule is not set, 'unknown' when the
 * analysis lacks the figure or there is too little history to judge).
 */
import type { AlertKind, AlertSettings } from '../../shared/api/alertSchemas'

export type Verdict = 'off' | 'unknown' | { breached: boolean; value: number; threshold: number }

export interface AlertInputs {
  fundamentalFraction: number | null
  finesse: number | null
  settings: AlertSettings
  /** Median finesse of the cavity's done analyses in the 30 days before this one; null with too few. */
  medianFinesse: number | null
  /**
   * The result's warnings or shares undermine it (shared/api/resultTrust.ts: an ambiguous reading, a geometry that
   * disagrees, many unassigned peaks, a share outside 0–100 %): it neither raises nor clears any rule, since a
   * trace read against the wrong geometry or family gives a wrong finesse too. @default false
   */
  readingInDoubt?: boolean
}

export function judgeAlerts(inputs: AlertInputs): Record<AlertKind, Verdict> {
  const { fundamentalFraction, finesse, settings, medianFinesse, readingInDoubt = false } = inputs
  const target = settings.targetFundamentalFraction
  const dropPercent = settings.finesseDropPercent
  const fraction: Verdict =
    target === null ? 'off' : fundamentalFraction === null || readingInDoubt ? 'unknown' : { breached: fundamentalFraction < target, value: fundamentalFraction, threshold: target }
  let drop: Verdict = 'off'
  if (dropPercent !== null) {
    if (finesse === null || medianFinesse === null || readingInDoubt) drop = 'unknown'
    else {
      const threshold = medianFinesse * (1 - dropPercent / 100)
      drop = { breached: finesse < threshold, value: finesse, threshold }
    }
  }
  return { fraction_below_target: fraction, finesse_drop: drop }
}

/** Payloads of the alert, watch and notification API, shared by server validation and client forms. */
import { z } from 'zod'

/** The two rules a cavity can be watched by. */
export const alertKinds = ['fraction_below_target', 'finesse_drop'] as const
export type AlertKind = (typeof alertKinds)[number]

/** `PUT /api/cavities/:id/alerts`: both rules at once; null switches a rule off. */
export const alertSettingsSchema = z
  .object({
    /** TEM00 fraction (0–1) below which an analysis breaches; null = no target. */
    targetFundamentalFraction: z
      .number({ error: 'targetFundamentalFraction must be a number or null' })
      .gt(0, 'targetFundamentalFraction must be above 0')
      .max(1, 'targetFundamentalFraction must be at most 1 (a fraction, not percent)')
      .nullable(),
    /** Percent below the cavity's 30-day median finesse that counts as a drop; null = no finesse alert. */
    finesseDropPercent: z
      .number({ error: 'finesseDropPercent must be a number or null' })
      .gt(0, 'finesseDropPercent must be above 0')
      .lt(100, 'finesseDropPercent must be below 100')
      .nullable(),
  })
  .strict()
export type AlertSettings = z.infer<typeof alertSettingsSchema>

export interface AlertState {
  kind: AlertKind
  breached: boolean
  /** Start of the ongoing breach. */
  since: string | null
  /** The analysis that last changed the state. */
  analysisId: string | null
}

/** `GET|PUT /api/cavities/:id/alerts`. */
export interface CavityAlerts {
  cavityId: string
  settings: AlertSettings
  states: AlertState[]
  /** Is the caller watching this cavity? */
  watching: boolean
  watcherCount: number
}

export type NotificationKind = `${AlertKind}` | `${AlertKind}_recovered`

export interface AppNotification {
  id: number
  kind: NotificationKind
  title: string
  body: string
  cavityId: string | null
  analysisId: string | null
  details: Record<string, unknown>
  createdAt: string
  readAt: string | null
}

export const notificationQuerySchema = z.object({
  unread: z.enum(['true', 'false', '1', '0']).transform((value) => value === 'true' || value === '1').optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
})

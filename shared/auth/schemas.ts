/**
 * One zod schema per payload of the accounts API, shared by the server (validation) and the client
 * (forms); the TypeScript types come from the schemas.
 */
import { z } from 'zod'
import { actions, roles } from './permissions'
import { maxPasswordLength } from './passwordPolicy'

export const roleSchema = z.enum(roles, { error: `must be one of ${roles.join(', ')}` })
export const actionSchema = z.enum(actions)

export const emailSchema = z
  .string({ error: 'is required' })
  .trim()
  .toLowerCase()
  .max(254, 'must be at most 254 characters')
  .pipe(z.email({ error: 'must be an e-mail address such as ada@lab.example.org' }))

/** Shape only; the full policy (length, common passwords, own name) is `passwordProblem`. */
export const passwordSchema = z.string({ error: 'is required' }).min(1, 'is required').max(maxPasswordLength, `must be at most ${maxPasswordLength} characters`)

export const personNameSchema = z.string({ error: 'is required' }).trim().min(1, 'is required').max(120, 'must be at most 120 characters')

/** A single-use link token as it arrives from an e-mailed link. */
export const linkTokenSchema = z.string({ error: 'is required' }).trim().min(20, 'is not a valid link token').max(200, 'is not a valid link token')

export const loginInputSchema = z.object({ email: emailSchema, password: passwordSchema })
export type LoginInput = z.infer<typeof loginInputSchema>

export const resetRequestInputSchema = z.object({ email: emailSchema })
export type ResetRequestInput = z.infer<typeof resetRequestInputSchema>

export const resetInputSchema = z.object({ token: linkTokenSchema, password: passwordSchema })
/** `POST /api/auth/password`: a signed-in person changes their own password. */
export const changePasswordInputSchema = z.object({ currentPassword: passwordSchema, newPassword: passwordSchema })
export type ChangePasswordInput = z.infer<typeof changePasswordInputSchema>
export type ResetInput = z.infer<typeof resetInputSchema>

export const invitationInputSchema = z.object({ email: emailSchema, role: roleSchema })
export type InvitationInput = z.infer<typeof invitationInputSchema>

export const acceptInvitationInputSchema = z.object({ token: linkTokenSchema, name: personNameSchema, password: passwordSchema })
export type AcceptInvitationInput = z.infer<typeof acceptInvitationInputSchema>

export const userPatchInputSchema = z
  .object({ role: roleSchema.optional(), disabled: z.boolean({ error: 'must be true or false' }).optional(), name: personNameSchema.optional() })
  .strict()
  .refine((patch) => Object.keys(patch).length > 0, { message: 'name at least one of role, disabled, name' })
export type UserPatchInput = z.infer<typeof userPatchInputSchema>

const YEAR_MS = 365.25 * 24 * 3600 * 1000
export const tokenInputSchema = z.object({
  name: z.string({ error: 'is required' }).trim().min(1, 'is required').max(80, 'must be at most 80 characters'),
  /** When the token stops working (ISO date or date-time). @default one year from now */
  expiresAt: z
    .union([z.iso.datetime({ offset: true, error: 'must be a date-time such as 2027-06-30T00:00:00Z' }), z.iso.date({ error: 'must be a date such as 2027-06-30' })])
    .refine((value) => Date.parse(value) > Date.now(), 'must be in the future')
    .refine((value) => Date.parse(value) <= Date.now() + 5 * YEAR_MS, 'must be at most 5 years ahead')
    .optional(),
})
export type TokenInput = z.infer<typeof tokenInputSchema>

export const auditQuerySchema = z.object({
  limit: z.coerce.number().int().min(1).max(500).default(100),
  before: z.coerce.number().int().positive().optional(),
  event: z.string().max(60).optional(),
})
export type AuditQuery = z.infer<typeof auditQuerySchema>

export const idParamSchema = z.coerce.number({ error: 'must be a whole number' }).int('must be a whole number').positive('must be positive')

/** The signed-in person, as `GET /api/auth/me` and sign-in answer it. */
export interface SessionUser {
  id: number
  email: string
  name: string
  role: z.infer<typeof roleSchema>
  /** Every action the role allows, from the permission table. */
  permissions: Array<z.infer<typeof actionSchema>>
  /** How this request was authenticated. */
  via: 'session' | 'token'
}

export interface SessionAnswer {
  user: SessionUser
}

/** A person as admins see them in `GET /api/users`. */
export interface UserSummary {
  id: number
  email: string
  name: string
  role: z.infer<typeof roleSchema>
  disabled: boolean
  createdAt: string
  lastSignInAt: string | null
}

export type InvitationStatus = 'pending' | 'accepted' | 'expired' | 'replaced'

export interface InvitationSummary {
  id: number
  email: string
  role: z.infer<typeof roleSchema>
  status: InvitationStatus
  invitedBy: string | null
  createdAt: string
  expiresAt: string
  acceptedAt: string | null
}

export interface TokenSummary {
  id: number
  name: string
  /** The first characters of the secret, to tell tokens apart. */
  prefix: string
  createdAt: string
  lastUsedAt: string | null
  revokedAt: string | null
  /** When it stops working (null: never, only for tokens made before expiry existed and kept so). */
  expiresAt: string | null
  /** Owner, included when an admin lists everyone's tokens. */
  owner?: { id: number; email: string; name: string }
}

/** Answer of `POST /api/tokens`: the secret is shown this once and never again. */
export interface CreatedToken {
  token: TokenSummary
  secret: string
}

export interface AuditEntry {
  id: number
  at: string
  event: string
  actorEmail: string | null
  subject: string | null
  ip: string | null
  details: Record<string, unknown>
}

export interface OutboxMessage {
  id: number
  receivedAt: string
  from: string
  to: string[]
  subject: string
  text: string
}

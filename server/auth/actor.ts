/** Who is making a request, as set by `authenticate` and read by `requirePermission` and the routes. */
import type { Request } from 'express'
import { actionsOf, type Role } from '../../shared/auth/permissions'
import type { SessionUser } from '../../shared/auth/schemas'
import { HttpError } from '../http/errors'

export interface Actor {
  id: number
  email: string
  name: string
  role: Role
  /** How this request proved who it is. */
  via: 'session' | 'token'
  /** The API token's id when `via` is `token`. */
  tokenId?: number
}

const actorKey = Symbol('cavitrace.actor')
type WithActor = Request & { [actorKey]?: Actor }

export function setActor(req: Request, actor: Actor): void {
  ;(req as WithActor)[actorKey] = actor
}

/** The authenticated actor, or null for an anonymous request. */
export function actorOf(req: Request): Actor | null {
  return (req as WithActor)[actorKey] ?? null
}

/** The authenticated actor; for use behind `requirePermission`, where one always exists. */
export function requireActor(req: Request): Actor {
  const actor = actorOf(req)
  if (!actor) throw new HttpError(401, 'not_signed_in', 'Sign in to continue.')
  return actor
}

export function toSessionUser(actor: Actor): SessionUser {
  return { id: actor.id, email: actor.email, name: actor.name, role: actor.role, permissions: actionsOf(actor.role), via: actor.via }
}

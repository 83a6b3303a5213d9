/** The one server-side permission check: 401 without a signed-in actor, 403 when the role lacks the action. */
import type { RequestHandler } from 'express'
import { can, roleLabels, type Action } from '../../shared/auth/permissions'
import { HttpError } from '../http/errors'
import { actorOf } from './actor'

export function requirePermission(action: Action): RequestHandler {
  return (req, _res, next) => {
    const actor = actorOf(req)
    if (!actor) return next(new HttpError(401, 'not_signed_in', 'Sign in to continue.'))
    if (!can(actor.role, action)) {
      return next(new HttpError(403, 'forbidden', `Your role (${roleLabels[actor.role].label}) may not do this; it needs the "${action}" permission.`))
    }
    next()
  }
}

/** Any signed-in actor, whatever the role. */
export const requireSignedIn: RequestHandler = (req, _res, next) => {
  next(actorOf(req) ? undefined : new HttpError(401, 'not_signed_in', 'Sign in to continue.'))
}

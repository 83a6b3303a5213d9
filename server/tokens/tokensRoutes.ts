/**
 * `GET|POST /api/tokens`, `DELETE /api/tokens/:id`. `GET /api/tokens?all=1` lists everyone's (admins);
 * `DELETE /api/users/:id/tokens` revokes all of one person's (admins). Tokens are managed from a signed-in
 * session only: a token cannot mint, list or revoke tokens (a leaked one must not be able to make more).
 */
import { Router, type RequestHandler } from 'express'
import { z } from 'zod'
import { idParamSchema, tokenInputSchema } from '../../shared/auth/schemas'
import { actorOf, requireActor } from '../auth/actor'
import { HttpError } from '../http/errors'
import { requirePermission } from '../auth/requirePermission'
import type { Db } from '../db/knex'
import { createToken, listTokensFor, revokeAllTokensOf, revokeTokenFor } from './tokensDomain'

const listQuerySchema = z.object({ all: z.enum(['0', '1', 'true', 'false']).optional() })

/** Refuse a request made with an API token. */
const sessionOnly: RequestHandler = (req, _res, next) => {
  if (actorOf(req)?.via === 'token') return next(new HttpError(403, 'session_required', 'API tokens are managed from a signed-in session (the tokens page), not with an API token.'))
  next()
}

export function tokensRoutes(db: Db): Router {
  const router = Router()
  router.delete('/users/:id/tokens', requirePermission('tokens.manageAll'), sessionOnly, async (req, res) => {
    res.json(await revokeAllTokensOf(db, requireActor(req), idParamSchema.parse(req.params.id), req.ip ?? null))
  })
  router.get('/tokens', requirePermission('tokens.manageOwn'), sessionOnly, async (req, res) => {
    const { all } = listQuerySchema.parse(req.query)
    res.json({ tokens: await listTokensFor(db, requireActor(req), all === '1' || all === 'true') })
  })
  router.post('/tokens', requirePermission('tokens.manageOwn'), sessionOnly, async (req, res) => {
    const input = tokenInputSchema.parse(req.body)
    res.status(201).json(await createToken(db, requireActor(req), input, req.ip ?? null))
  })
  router.delete('/tokens/:id', requirePermission('tokens.manageOwn'), sessionOnly, async (req, res) => {
    const id = idParamSchema.parse(req.params.id)
    res.json({ token: await revokeTokenFor(db, requireActor(req), id, req.ip ?? null) })
  })
  return router
}

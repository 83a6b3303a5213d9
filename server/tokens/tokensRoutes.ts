/** `GET|POST /api/tokens`, `DELETE /api/tokens/:id`. `GET /api/tokens?all=1` lists everyone's (admins). */
import { Router } from 'express'
import { z } from 'zod'
import { idParamSchema, tokenInputSchema } from '../../shared/auth/schemas'
import { requireActor } from '../auth/actor'
import { requirePermission } from '../auth/requirePermission'
import type { Db } from '../db/knex'
import { createToken, listTokensFor, revokeTokenFor } from './tokensDomain'

const listQuerySchema = z.object({ all: z.enum(['0', '1', 'true', 'false']).optional() })

export function tokensRoutes(db: Db): Router {
  const router = Router()
  router.get('/tokens', requirePermission('tokens.manageOwn'), async (req, res) => {
    const { all } = listQuerySchema.parse(req.query)
    res.json({ tokens: await listTokensFor(db, requireActor(req), all === '1' || all === 'true') })
  })
  router.post('/tokens', requirePermission('tokens.manageOwn'), async (req, res) => {
    const input = tokenInputSchema.parse(req.body)
    res.status(201).json(await createToken(db, requireActor(req), input, req.ip ?? null))
  })
  router.delete('/tokens/:id', requirePermission('tokens.manageOwn'), async (req, res) => {
    const id = idParamSchema.parse(req.params.id)
    res.json({ token: await revokeTokenFor(db, requireActor(req), id, req.ip ?? null) })
  })
  return router
}

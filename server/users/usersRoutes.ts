/** `GET /api/users`, `PATCH /api/users/:id` — admins only. */
import { Router } from 'express'
import { idParamSchema, userPatchInputSchema } from '../../shared/auth/schemas'
import { requireActor } from '../auth/actor'
import { requirePermission } from '../auth/requirePermission'
import type { Db } from '../db/knex'
import { changePerson, listPeople } from './usersDomain'

export function usersRoutes(db: Db): Router {
  const router = Router()
  router.get('/users', requirePermission('users.manage'), async (_req, res) => {
    res.json({ users: await listPeople(db) })
  })
  router.patch('/users/:id', requirePermission('users.manage'), async (req, res) => {
    const id = idParamSchema.parse(req.params.id)
    const patch = userPatchInputSchema.parse(req.body)
    res.json({ user: await changePerson(db, requireActor(req), id, patch, req.ip ?? null) })
  })
  return router
}

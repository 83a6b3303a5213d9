/**
 * Cavity proposals: `POST /api/cavity-proposals` (experimenters and up), `GET /api/cavity-proposals` (everyone),
 * `POST /api/cavities/:id/approve` and `DELETE /api/cavity-proposals/:id` (leads and admins). Audited.
 */
import { Router } from 'express'
import { cavityInputSchema } from '../../shared/api/cavitySchemas'
import { recordAudit } from '../audit/auditData'
import { requireActor } from '../auth/actor'
import { requirePermission } from '../auth/requirePermission'
import type { AppContext } from '../app'
import { HttpError } from '../http/errors'
import { approveCavity, deleteProposal, listCavities } from './cavityRepository'
import { parseId } from './cavityRoutes'
import { createCavity, getCavity } from './cavityService'

export function proposalRoutes(context: AppContext): Router {
  const { db } = context
  const router = Router()

  router.get('/cavity-proposals', requirePermission('lab.read'), async (_req, res) => {
    res.json({ cavities: await listCavities(db, { pending: true }) })
  })

  router.post('/cavity-proposals', requirePermission('cavities.propose'), async (req, res) => {
    const actor = requireActor(req)
    const cavity = await createCavity(db, cavityInputSchema.parse(req.body), { proposedBy: actor.id })
    await recordAudit(db, { event: 'cavity.proposed', actor, subject: cavity.name, details: { cavityId: cavity.id } })
    res.status(201).json({ cavity })
  })

  router.post('/cavities/:id/approve', requirePermission('cavities.write'), async (req, res) => {
    const id = parseId(req.params.id, 'cavity')
    const cavity = await getCavity(db, id)
    if (!(await approveCavity(db, id))) throw new HttpError(409, 'not_a_proposal', `Cavity "${cavity.name}" is not waiting for approval.`)
    await recordAudit(db, { event: 'cavity.approved', actor: requireActor(req), subject: cavity.name, details: { cavityId: id, proposedBy: cavity.proposedBy } })
    res.json({ cavity: await getCavity(db, id) })
  })

  router.delete('/cavity-proposals/:id', requirePermission('cavities.write'), async (req, res) => {
    const id = parseId(req.params.id, 'cavity')
    const cavity = await getCavity(db, id)
    if (!(await deleteProposal(db, id))) throw new HttpError(409, 'not_a_proposal', `Cavity "${cavity.name}" is not waiting for approval; archive it instead.`)
    await recordAudit(db, { event: 'cavity.rejected', actor: requireActor(req), subject: cavity.name, details: { cavityId: id, proposedBy: cavity.proposedBy } })
    res.status(204).end()
  })

  return router
}

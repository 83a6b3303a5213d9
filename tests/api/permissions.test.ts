/**
 * The permission-table walk (issue 3): for every protected route, no credentials → 401, each role
 * without the action → 403, each role with it → success. Expectations come from the one table in
 * shared/auth/permissions.ts; the routes come from tests/api/auth/protectedRoutes.ts.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { can, roles, type Role } from '../../shared/auth/permissions'
import { startTestServer, type TestServer } from '../support/testServer'
import { createPerson, signedIn, type SignedInAgent } from './auth/accountsTestKit'
import { protectedRoutes } from './auth/protectedRoutes'

describe('the permission table, walked over every protected route', () => {
  let server: TestServer
  const callers = new Map<Role, { agent: SignedInAgent; id: number; role: Role; email: string }>()

  beforeAll(async () => {
    server = await startTestServer()
    for (const role of roles) {
      const person = await createPerson(server, role)
      callers.set(role, { agent: await signedIn(server, person.email), id: person.id, role, email: person.email })
    }
  })
  afterAll(() => server.close())

  for (const route of protectedRoutes) {
    const label = `${route.method.toUpperCase()} ${route.route}`

    it(`when ${label} is called without credentials then it answers 401`, async () => {
      // Built as for an admin, so the target exists and only the missing credentials can explain a 401.
      const { path, body, attach } = await route.request({ server, caller: callers.get('admin')! })
      const call = request(server.url)[route.method](path).set('Origin', server.url)
      const response = attach ? await call.attach(attach.field, attach.content, attach.fileName) : await call.send(body as object)
      expect(response.status).toBe(401)
      expect(response.body.error.code).toBe('not_signed_in')
    })

    for (const role of roles) {
      const allowed = route.action === 'signedIn' || can(role, route.action)
      it(`when ${label} is called by a ${role} then it answers ${allowed ? route.okStatus : 403}`, async () => {
        const caller = callers.get(role)!
        const { path, body, attach } = await route.request({ server, caller })
        const call = caller.agent[route.method](path)
        const response = attach ? await call.attach(attach.field, attach.content, attach.fileName) : await call.send(body as object)
        expect(response.status, JSON.stringify(response.body)).toBe(allowed ? route.okStatus : 403)
        if (!allowed) expect(response.body.error.code).toBe('forbidden')
      })
    }
  }

  it('when the walk is listed then it covers every route of the accounts API named in issue 3', () => {
    const walked = new Set(protectedRoutes.map((route) => `${route.method.toUpperCase()} ${route.route}`))
    for (const expected of ['GET /api/auth/me', 'GET /api/users', 'PATCH /api/users/:id', 'GET /api/invitations', 'POST /api/invitations', 'GET /api/tokens', 'POST /api/tokens', 'DELETE /api/tokens/:id', 'GET /api/audit']) {
      expect(walked.has(expected), expected).toBe(true)
    }
  })
})

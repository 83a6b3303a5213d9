/**
 * Every protected API route, with the action it needs and how to call it successfully — the list
 * tests/api/permissions.test.ts walks. Add a line here when you add a protected route.
 */
import type { Action, Role } from '../../../shared/auth/permissions'
import { newApiToken } from '../../../server/tokens/secretTokens'
import { insertToken } from '../../../server/tokens/tokensData'
import type { TestServer } from '../../support/testServer'
import { tuningFixture } from '../../support/tuningFixtures'
import { testCavityGeometry } from '../../support/traceFiles'
import { createPerson, uniqueEmail } from './accountsTestKit'

/** What a case may use to build its request. */
export interface WalkContext {
  server: TestServer
  /** The person making the request (one per role). */
  caller: { id: number; role: Role; email: string }
}

export interface ProtectedRouteCase {
  method: 'get' | 'post' | 'patch' | 'put' | 'delete'
  /** Pattern as documented, e.g. `/api/users/:id`. */
  route: string
  /** The action from shared/auth/permissions.ts, or `signedIn` for any signed-in person. */
  action: Action | 'signedIn'
  /** Status of a permitted call. */
  okStatus: number
  /** Build a fresh, valid request for the caller (called for every role, so make unique data). */
  request(context: WalkContext): Promise<{ path: string; body?: unknown; attach?: { field: string; content: Buffer; fileName: string } }>
}

const at = (path: string, body?: unknown) => async () => ({ path, body })

export const protectedRoutes: ProtectedRouteCase[] = [
  { method: 'get', route: '/api/auth/me', action: 'signedIn', okStatus: 200, request: at('/api/auth/me') },
  { method: 'get', route: '/api/users', action: 'users.manage', okStatus: 200, request: at('/api/users') },
  {
    method: 'patch',
    route: '/api/users/:id',
    action: 'users.manage',
    okStatus: 200,
    async request({ server }) {
      const person = await createPerson(server, 'viewer')
      return { path: `/api/users/${person.id}`, body: { name: 'Renamed By Walk' } }
    },
  },
  { method: 'get', route: '/api/invitations', action: 'users.manage', okStatus: 200, request: at('/api/invitations') },
  { method: 'post', route: '/api/invitations', action: 'users.manage', okStatus: 201, request: async () => ({ path: '/api/invitations', body: { email: uniqueEmail('walk'), role: 'viewer' } }) },
  { method: 'get', route: '/api/tokens', action: 'tokens.manageOwn', okStatus: 200, request: at('/api/tokens') },
  { method: 'post', route: '/api/tokens', action: 'tokens.manageOwn', okStatus: 201, request: at('/api/tokens', { name: 'walk token' }) },
  {
    method: 'delete',
    route: '/api/tokens/:id',
    action: 'tokens.manageOwn',
    okStatus: 200,
    async request({ server, caller }) {
      const fresh = newApiToken()
      const token = await insertToken(server.db, { userId: caller.id, name: 'to revoke', prefix: fresh.prefix, hash: fresh.hash })
      return { path: `/api/tokens/${token.id}` }
    },
  },
  { method: 'get', route: '/api/tokens?all=1', action: 'tokens.manageAll', okStatus: 200, request: at('/api/tokens?all=1') },
  { method: 'get', route: '/api/audit', action: 'audit.read', okStatus: 200, request: at('/api/audit') },
  { method: 'get', route: '/api/outbox', action: 'outbox.read', okStatus: 200, request: at('/api/outbox') },
  // The tuning loop (issue 6). GET /api/cavities/:id/events is a never-ending stream, so it is checked in tuningLoop.test.ts instead.
  { method: 'get', route: '/api/cavities', action: 'lab.read', okStatus: 200, request: at('/api/cavities') },
  { method: 'post', route: '/api/cavities', action: 'cavities.write', okStatus: 201, request: async () => ({ path: '/api/cavities', body: { name: `Walk cavity ${uniqueEmail('c')}`, ...testCavityGeometry } }) },
  { method: 'get', route: '/api/cavities/:id', action: 'lab.read', okStatus: 200, request: async ({ server }) => ({ path: `/api/cavities/${(await tuningFixture(server)).cavityId}` }) },
  { method: 'patch', route: '/api/cavities/:id', action: 'cavities.write', okStatus: 200, request: async ({ server }) => ({ path: `/api/cavities/${(await tuningFixture(server)).cavityId}`, body: { location: 'Walked table' } }) },
  { method: 'get', route: '/api/cavities/:id/history', action: 'lab.read', okStatus: 200, request: async ({ server }) => ({ path: `/api/cavities/${(await tuningFixture(server)).cavityId}/history` }) },
  {
    method: 'post',
    route: '/api/cavities/:id/traces',
    action: 'traces.upload',
    okStatus: 202,
    async request({ server, caller }) {
      const fixture = await tuningFixture(server)
      return { path: `/api/cavities/${fixture.cavityId}/traces`, attach: { field: 'file', content: Buffer.from(`${fixture.csv}\n# ${caller.role}\n`), fileName: `${caller.role}.csv` } }
    },
  },
  { method: 'get', route: '/api/traces/:id', action: 'lab.read', okStatus: 200, request: async ({ server }) => ({ path: `/api/traces/${(await tuningFixture(server)).traceId}` }) },
  { method: 'get', route: '/api/traces/:id/file', action: 'lab.read', okStatus: 200, request: async ({ server }) => ({ path: `/api/traces/${(await tuningFixture(server)).traceId}/file` }) },
  { method: 'post', route: '/api/traces/:id/analyses', action: 'analyses.run', okStatus: 202, request: async ({ server }) => ({ path: `/api/traces/${(await tuningFixture(server)).traceId}/analyses`, body: { peakModel: 'auto' } }) },
  { method: 'get', route: '/api/analyses/:id', action: 'lab.read', okStatus: 200, request: async ({ server }) => ({ path: `/api/analyses/${(await tuningFixture(server)).analysisId}` }) },
]

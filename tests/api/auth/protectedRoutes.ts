/**
 * Every protected API route, with the action it needs and how to call it successfully — the list
 * tests/api/permissions.test.ts walks. Add a line here when you add a protected route.
 */
import type { Action, Role } from '../../../shared/auth/permissions'
import { newApiToken } from '../../../server/tokens/secretTokens'
import { insertToken } from '../../../server/tokens/tokensData'
import type { TestServer } from '../../support/testServer'
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
  request(context: WalkContext): Promise<{ path: string; body?: unknown }>
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
]

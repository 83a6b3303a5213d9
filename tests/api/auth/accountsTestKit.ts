/** Small factories for the accounts API tests: people straight into the database, and signed-in agents. */
import request from 'supertest'
import type { Role } from '../../../shared/auth/permissions'
import { hashPassword } from '../../../server/auth/passwords'
import { insertUser, type UserRecord } from '../../../server/users/usersData'
import type { TestServer } from '../../support/testServer'

export const testPassword = 'a long enough test passphrase'

let counter = 0
/** A unique address in the reserved .test domain. */
export function uniqueEmail(label = 'person'): string {
  counter += 1
  return `${label}-${process.pid}-${counter}@lab.cavitrace.test`
}

/** Insert a person directly (no invitation), with `testPassword` unless told otherwise. */
export async function createPerson(server: TestServer, role: Role, options: { email?: string; name?: string; password?: string } = {}): Promise<UserRecord> {
  const { email = uniqueEmail(role), name = `Test ${role}`, password = testPassword } = options
  return insertUser(server.db, { email, name, role, passwordHash: await hashPassword(password) })
}

/** A cookie-keeping client that sends this app's Origin on every request, as a browser would. */
export function browserAgent(server: TestServer) {
  return request.agent(server.url).set('Origin', server.url)
}

/** A browser-like client already signed in as `email`. */
export async function signedIn(server: TestServer, email: string, password = testPassword) {
  const agent = browserAgent(server)
  const response = await agent.post('/api/auth/login').send({ email, password })
  if (response.status !== 200) throw new Error(`sign-in as ${email} failed: ${response.status} ${JSON.stringify(response.body)}`)
  return agent
}

export type SignedInAgent = Awaited<ReturnType<typeof signedIn>>

/**
 * Test people: a user of a given role with an API token, created straight in the database, so API
 * tests can act as any role without going through sign-in (which has its own tests).
 */
import type { Role } from '../../shared/auth/permissions'
import type { Db } from '../../server/db/knex'
import { newApiToken } from '../../server/tokens/secretTokens'
import { insertToken } from '../../server/tokens/tokensData'
import { insertUser } from '../../server/users/usersData'

export interface TestActor {
  id: number
  role: Role
  /** `Authorization` header value for this actor's API token. */
  authorization: string
}

let counter = 0

export async function createActor(db: Db, role: Role): Promise<TestActor> {
  counter += 1
  // A placeholder hash: these people never sign in with a password.
  const user = await insertUser(db, { email: `${role}-${process.pid}-${counter}@tests.cavitrace.test`, name: `Test ${role} ${counter}`, role, passwordHash: 'not-a-password' })
  const token = newApiToken()
  await insertToken(db, { userId: user.id, name: 'tests', prefix: token.prefix, hash: token.hash })
  return { id: user.id, role, authorization: `Bearer ${token.secret}` }
}

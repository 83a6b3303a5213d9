/**
 * Issue 17, item 1: nobody else on the machine may open the database, and the session key is not in it.
 * The test cluster is made by the same code as `npm start`'s (scripts/lib/services.mjs).
 */
import { spawnSync } from 'node:child_process'
import { chmodSync, mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { readSecretFile } from '../../../server/auth/sessionSecret'
import { createPerson, signedIn } from '../auth/accountsTestKit'
import { startTestServer, type TestServer } from '../../support/testServer'

const clusterUrl = new URL(process.env.CAVITRACE_TEST_PG ?? 'postgres://unset@127.0.0.1:1/')
const port = Number(clusterUrl.port)
const isRoot = process.getuid?.() === 0

/** Try to connect and run one query; resolves with the error message, or 'connected'. */
async function attempt(config: pg.ClientConfig): Promise<string> {
  const client = new pg.Client({ ...config, database: 'postgres', connectionTimeoutMillis: 5000 })
  try {
    await client.connect()
    await client.query('SELECT 1')
    return 'connected'
  } catch (error) {
    return String((error as Error).message)
  } finally {
    await client.end().catch(() => undefined)
  }
}

describe('the project-local cluster', () => {
  it('when a client connects over TCP with the password then it is let in (the control)', async () => {
    expect(await attempt({ host: '127.0.0.1', port, user: 'postgres', password: decodeURIComponent(clusterUrl.password) })).toBe('connected')
  })

  it('when a client connects over TCP without the password or with a wrong one then it is refused', async () => {
    expect(await attempt({ host: '127.0.0.1', port, user: 'postgres' })).toMatch(/password/i)
    expect(await attempt({ host: '127.0.0.1', port, user: 'postgres', password: 'guessed' })).toMatch(/password authentication failed/)
  })

  it('when a client connects on the socket without the password then it is refused', async () => {
    const socket = process.env.CAVITRACE_TEST_PG_SOCKET
    expect(socket, 'npm test sets CAVITRACE_TEST_PG_SOCKET').toBeTruthy()
    expect(await attempt({ host: socket, port, user: 'postgres' })).toMatch(/password/i)
  })

  // Only root can act as another OS user; on a developer's own account this case is skipped.
  it.runIf(isRoot)('when another OS user (nobody) runs psql against the cluster then it is refused on TCP and on the socket', () => {
    const psql = join(process.env.CAVITRACE_TEST_PG_BIN ?? '/usr/lib/postgresql/15/bin', 'psql')
    const asNobody = (host: string) =>
      spawnSync('runuser', ['-u', 'nobody', '--', psql, '-w', '-h', host, '-p', String(port), '-U', 'postgres', '-d', 'postgres', '-c', 'SELECT 1'], { encoding: 'utf8', cwd: '/' })
    const tcp = asNobody('127.0.0.1')
    expect(tcp.status).not.toBe(0)
    expect(tcp.stderr).toMatch(/no password supplied|password authentication failed/)
    const socket = asNobody(process.env.CAVITRACE_TEST_PG_SOCKET ?? '')
    expect(socket.status).not.toBe(0)
    expect(socket.stderr).toMatch(/Permission denied|no password supplied/)
  })
})

describe('the session-signing key', () => {
  let server: TestServer
  beforeAll(async () => {
    server = await startTestServer()
  })
  afterAll(() => server.close())

  it('when someone signs in then no session key is written to the database', async () => {
    const person = await createPerson(server, 'viewer')
    const agent = await signedIn(server, person.email)
    expect((await agent.get('/api/auth/me')).status).toBe(200)
    expect(await server.db('app_settings').where({ key: 'session_secret' }).first()).toBeUndefined()
  })

  it('when the key file can be read by others then the server refuses it; at 0600 it is read', () => {
    const path = join(mkdtempSync(join(tmpdir(), 'secret-')), 'session-secret')
    writeFileSync(path, `${'k'.repeat(40)}\n`, { mode: 0o644 })
    chmodSync(path, 0o644)
    expect(() => readSecretFile(path)).toThrow(/can be read by other users; run "chmod 600/)
    chmodSync(path, 0o600)
    expect(readSecretFile(path)).toBe('k'.repeat(40))
  })
})

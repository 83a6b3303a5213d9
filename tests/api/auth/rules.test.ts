/** The account rules that need no server: the role table against issue 3, the password policy, configuration. */
import { describe, expect, it } from 'vitest'
import { loadConfig } from '../../../server/config'
import { parseMessage } from '../../../server/mail/parseMessage'
import { actions, can, permissionTable, roles, rolesAllowed } from '../../../shared/auth/permissions'
import { passwordProblem } from '../../../shared/auth/passwordPolicy'

describe('the permission table', () => {
  it('when read against issue 3 then each role has exactly its duties', () => {
    expect(permissionTable.admin).toEqual(actions)
    expect(rolesAllowed('users.manage')).toEqual(['admin'])
    expect(rolesAllowed('audit.read')).toEqual(['admin'])
    expect(rolesAllowed('cavities.write')).toEqual(['admin', 'lead'])
    expect(rolesAllowed('targets.write')).toEqual(['admin', 'lead'])
    expect(rolesAllowed('analyses.run')).toEqual(['admin', 'lead', 'experimenter'])
    expect(rolesAllowed('notes.write')).toEqual(['admin', 'lead', 'experimenter'])
    expect(rolesAllowed('logbook.write')).toEqual(['admin', 'lead', 'technician'])
    expect(rolesAllowed('traces.upload')).toEqual(['admin', 'lead', 'experimenter', 'technician'])
    expect(rolesAllowed('lab.read')).toEqual([...roles])
    // Undoing a wrong upload (issue 13): whoever uploads may correct their own; leads and admins anyone's; admins restore.
    expect(rolesAllowed('uploads.correct')).toEqual(rolesAllowed('traces.upload'))
    expect(rolesAllowed('uploads.correctAny')).toEqual(['admin', 'lead'])
    expect(rolesAllowed('uploads.restore')).toEqual(['admin'])
    // Roles of issue 13: experimenters propose cavities (leads and admins approve), technicians save lens plans.
    expect(rolesAllowed('cavities.propose')).toEqual(['admin', 'lead', 'experimenter'])
    expect(rolesAllowed('plans.write')).toEqual(['admin', 'lead', 'experimenter', 'technician'])
    expect(rolesAllowed('plans.manageAny')).toEqual(['admin', 'lead'])
    expect(permissionTable.viewer).toEqual(['lab.read', 'tokens.manageOwn'])
  })

  it('when asked about no role or an unknown role then nothing is allowed', () => {
    expect(can(null, 'lab.read')).toBe(false)
    expect(can('janitor' as never, 'lab.read')).toBe(false)
  })
})

describe('the password policy (NIST SP 800-63B §5.1.1.2: length, no composition rules, refuse the obvious)', () => {
  it('when a long passphrase of plain lower-case words is given then it is accepted', () => {
    expect(passwordProblem('correct mirror alignment')).toBeNull()
    expect(passwordProblem('ü'.repeat(5) + 'ñ'.repeat(7))).toBeNull()
  })
  it('when it is short, too long, one repeated character, common, or the person’s address or name then it is refused', () => {
    expect(passwordProblem('elevenchars')).toMatch(/at least 12/)
    expect(passwordProblem('x'.repeat(257))).toMatch(/at most 256/)
    expect(passwordProblem('a'.repeat(20))).toMatch(/one repeated character/)
    expect(passwordProblem('Password1234')).toMatch(/most common passwords/)
    expect(passwordProblem('Nia.Newcomer@lab.example', { email: 'nia.newcomer@lab.example' })).toMatch(/e-mail address/)
    expect(passwordProblem('nia.newcomer', { email: 'nia.newcomer@lab.example' })).toMatch(/e-mail address/)
    expect(passwordProblem('Wilhelmina Testbank', { name: 'wilhelmina testbank' })).toMatch(/your name/)
  })
  it('when counting length then characters are counted, not UTF-16 units', () => {
    expect(passwordProblem('🔭'.repeat(6) + 'abcde')).toMatch(/at least 12/) // 11 characters, 17 UTF-16 units
  })
})

describe('account configuration', () => {
  const base = { DATABASE_URL: 'postgres://x@127.0.0.1/x' }
  it('when production starts without SESSION_SECRET then it stops with a message naming the variable', () => {
    expect(() => loadConfig({ ...base, NODE_ENV: 'production' })).toThrow(/SESSION_SECRET is required in production/)
    expect(loadConfig({ ...base, NODE_ENV: 'production', SESSION_SECRET: 's'.repeat(32) }).SESSION_SECRET).toHaveLength(32)
  })
  it('when only one of the first-admin variables is set then it names the missing one', () => {
    expect(() => loadConfig({ ...base, CAVITRACE_ADMIN_EMAIL: 'a@b.example' })).toThrow(/CAVITRACE_ADMIN_PASSWORD must be set together/)
  })
})

describe('reading captured mail', () => {
  it('when the body is quoted-printable and the subject an RFC 2047 encoded word then both are decoded', () => {
    const raw = 'Subject: =?UTF-8?Q?R=C3=A9sonance_check?=\r\nContent-Transfer-Encoding: quoted-printable\r\n\r\nline one=\r\n continues =C3=A9\r\n'
    expect(parseMessage(raw)).toEqual({ subject: 'Résonance check', text: 'line one continues é' })
  })
  it('when the body is base64 then it is decoded', () => {
    const raw = `Subject: plain\nContent-Transfer-Encoding: base64\n\n${Buffer.from('hello\nworld').toString('base64')}\n`
    expect(parseMessage(raw)).toEqual({ subject: 'plain', text: 'hello\nworld' })
  })
})

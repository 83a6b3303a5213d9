/** Data access for people (`users` table). Returns plain objects; callers never see Knex rows. */
import type { Role } from '../../shared/auth/permissions'
import type { UserSummary } from '../../shared/auth/schemas'
import type { Db } from '../db/knex'

export interface UserRecord {
  id: number
  email: string
  name: string
  role: Role
  passwordHash: string
  sessionVersion: number
  disabledAt: Date | null
  lastSignInAt: Date | null
  createdAt: Date
}

/** A `users` row as the database returns it. */
export interface UserRow {
  id: number
  email: string
  name: string
  role: Role
  password_hash: string
  session_version: number
  disabled_at: Date | null
  last_sign_in_at: Date | null
  created_at: Date
}

export function toRecord(row: UserRow): UserRecord {
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    role: row.role,
    passwordHash: row.password_hash,
    sessionVersion: row.session_version,
    disabledAt: row.disabled_at,
    lastSignInAt: row.last_sign_in_at,
    createdAt: row.created_at,
  }
}

/** The admin-facing view of a person (never the hash). */
export function toUserSummary(user: UserRecord): UserSummary {
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    disabled: user.disabledAt !== null,
    createdAt: user.createdAt.toISOString(),
    lastSignInAt: user.lastSignInAt?.toISOString() ?? null,
  }
}

export async function findUserByEmail(db: Db, email: string): Promise<UserRecord | null> {
  const row = await db<UserRow>('users').where({ email: email.toLowerCase() }).first()
  return row ? toRecord(row) : null
}

export async function findUserById(db: Db, id: number): Promise<UserRecord | null> {
  const row = await db<UserRow>('users').where({ id }).first()
  return row ? toRecord(row) : null
}

export async function listUsers(db: Db): Promise<UserRecord[]> {
  const rows = await db<UserRow>('users').orderBy([{ column: 'disabled_at', order: 'asc', nulls: 'first' }, { column: 'name' }])
  return rows.map(toRecord)
}

export async function insertUser(db: Db, user: { email: string; name: string; role: Role; passwordHash: string }): Promise<UserRecord> {
  const [row] = await db<UserRow>('users')
    .insert({ email: user.email.toLowerCase(), name: user.name, role: user.role, password_hash: user.passwordHash })
    .returning('*')
  return toRecord(row as UserRow)
}

export interface UserChanges {
  name?: string
  role?: Role
  disabled?: boolean
  passwordHash?: string
  /** Invalidate every session cookie issued so far. */
  endSessions?: boolean
}

export async function updateUser(db: Db, id: number, changes: UserChanges): Promise<UserRecord | null> {
  const patch: Record<string, unknown> = { updated_at: db.fn.now() }
  if (changes.name !== undefined) patch.name = changes.name
  if (changes.role !== undefined) patch.role = changes.role
  if (changes.disabled !== undefined) patch.disabled_at = changes.disabled ? db.fn.now() : null
  if (changes.passwordHash !== undefined) patch.password_hash = changes.passwordHash
  if (changes.endSessions) patch.session_version = db.raw('session_version + 1')
  const [row] = await db<UserRow>('users').where({ id }).update(patch).returning('*')
  return row ? toRecord(row as UserRow) : null
}

export async function recordSignIn(db: Db, id: number): Promise<void> {
  await db('users').where({ id }).update({ last_sign_in_at: db.fn.now() })
}

/** Active (not disabled) admins, optionally leaving one person out. */
export async function countActiveAdmins(db: Db, exceptUserId?: number): Promise<number> {
  const query = db('users').where({ role: 'admin' }).whereNull('disabled_at')
  if (exceptUserId !== undefined) query.whereNot({ id: exceptUserId })
  const [{ count }] = (await query.count({ count: '*' })) as Array<{ count: string | number }>
  return Number(count)
}

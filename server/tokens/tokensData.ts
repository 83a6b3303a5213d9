/** Data access for API tokens (`api_tokens`). Only hashes are stored. */
import type { TokenSummary } from '../../shared/auth/schemas'
import type { Db } from '../db/knex'
import { toRecord as userFromRow, type UserRecord, type UserRow } from '../users/usersData'

interface TokenRow {
  id: number
  user_id: number
  name: string
  prefix: string
  created_at: Date
  last_used_at: Date | null
  revoked_at: Date | null
  expires_at: Date | null
  owner_email?: string
  owner_name?: string
}

export interface TokenRecord {
  id: number
  userId: number
  summary: TokenSummary
}

function toRecord(row: TokenRow, withOwner: boolean): TokenRecord {
  const summary: TokenSummary = {
    id: row.id,
    name: row.name,
    prefix: row.prefix,
    createdAt: row.created_at.toISOString(),
    lastUsedAt: row.last_used_at?.toISOString() ?? null,
    revokedAt: row.revoked_at?.toISOString() ?? null,
    expiresAt: row.expires_at?.toISOString() ?? null,
  }
  if (withOwner) summary.owner = { id: row.user_id, email: row.owner_email ?? '', name: row.owner_name ?? '' }
  return { id: row.id, userId: row.user_id, summary }
}

const columns = ['api_tokens.id', 'api_tokens.user_id', 'api_tokens.name', 'api_tokens.prefix', 'api_tokens.created_at', 'api_tokens.last_used_at', 'api_tokens.revoked_at', 'api_tokens.expires_at']

/** Insert a token; `expiresAt` defaults to one year from now (null: never). */
export async function insertToken(db: Db, token: { userId: number; name: string; prefix: string; hash: string; expiresAt?: Date | null }): Promise<TokenRecord> {
  const expires = token.expiresAt === undefined ? db.raw("now() + interval '1 year'") : token.expiresAt
  const [row] = await db('api_tokens')
    .insert({ user_id: token.userId, name: token.name, prefix: token.prefix, token_hash: token.hash, expires_at: expires })
    .returning(['id', 'user_id', 'name', 'prefix', 'created_at', 'last_used_at', 'revoked_at', 'expires_at'])
  return toRecord(row as TokenRow, false)
}

/** One person's tokens, or everyone's (with owners) when `userId` is omitted; newest first. */
export async function listTokens(db: Db, userId?: number): Promise<TokenRecord[]> {
  const query = db('api_tokens')
    .join('users', 'users.id', 'api_tokens.user_id')
    .select([...columns, 'users.email as owner_email', 'users.name as owner_name'])
    .orderBy('api_tokens.id', 'desc')
  if (userId !== undefined) query.where('api_tokens.user_id', userId)
  const rows = (await query) as TokenRow[]
  return rows.map((row) => toRecord(row, userId === undefined))
}

export async function findToken(db: Db, id: number): Promise<TokenRecord | null> {
  const row = (await db('api_tokens').select(columns).where('api_tokens.id', id).first()) as TokenRow | undefined
  return row ? toRecord(row, false) : null
}

/** Revoke every live token of one person; returns how many were revoked. */
export async function revokeTokensOfUser(db: Db, userId: number): Promise<number> {
  return db('api_tokens').where({ user_id: userId }).whereNull('revoked_at').update({ revoked_at: db.fn.now() })
}

/** Mark a token revoked; true when this call revoked it (false when already revoked). */
export async function revokeToken(db: Db, id: number): Promise<boolean> {
  const changed = await db('api_tokens').where({ id }).whereNull('revoked_at').update({ revoked_at: db.fn.now() })
  return changed > 0
}

/** The live token with this hash and its owner, in one query, or null. Marks it used (at most once a minute). */
export async function useTokenByHash(db: Db, hash: string): Promise<{ tokenId: number; owner: UserRecord } | null> {
  const row = (await db('api_tokens as t')
    .join('users as u', 'u.id', 't.user_id')
    .where('t.token_hash', hash)
    .whereNull('t.revoked_at')
    .where((live) => live.whereNull('t.expires_at').orWhere('t.expires_at', '>', db.fn.now()))
    .first('u.*', 't.id as token_id', 't.last_used_at as token_last_used_at')) as (UserRow & { token_id: number; token_last_used_at: Date | null }) | undefined
  if (!row) return null
  // A script polling many times a second must not turn every read into a write.
  if (!row.token_last_used_at || Date.now() - row.token_last_used_at.getTime() > 60_000) {
    await db('api_tokens').where({ id: row.token_id }).update({ last_used_at: db.fn.now() })
  }
  return { tokenId: row.token_id, owner: userFromRow(row) }
}

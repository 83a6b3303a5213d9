/**
 * High-entropy secrets for e-mailed links and API tokens. Only their SHA-256 hashes are stored: a
 * 256-bit random secret needs no slow hash, and a leaked table then opens nothing.
 */
import { createHash, randomBytes } from 'node:crypto'

/** Hex SHA-256 of a secret, the form in which secrets are stored and looked up. */
export function hashSecret(secret: string): string {
  return createHash('sha256').update(secret, 'utf8').digest('hex')
}

/** A fresh single-use link token (256 bits, URL-safe) and its hash. */
export function newLinkToken(): { secret: string; hash: string } {
  const secret = randomBytes(32).toString('base64url')
  return { secret, hash: hashSecret(secret) }
}

/** Every API token starts with this, so a leaked one is easy to recognise in logs and code. */
export const apiTokenMarker = 'ctk_'

/** A fresh API token, the short prefix shown in lists, and its hash. */
export function newApiToken(): { secret: string; prefix: string; hash: string } {
  const secret = `${apiTokenMarker}${randomBytes(32).toString('base64url')}`
  return { secret, prefix: secret.slice(0, apiTokenMarker.length + 6), hash: hashSecret(secret) }
}

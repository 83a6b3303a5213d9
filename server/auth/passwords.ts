/** Password hashing with argon2id (the package's defaults: 64 MiB, 3 passes, 4 lanes). */
import argon2 from 'argon2'

export function hashPassword(password: string): Promise<string> {
  return argon2.hash(password, { type: argon2.argon2id })
}

// Verified against when the address is unknown, so a wrong address costs as long as a wrong password.
let decoyHash: Promise<string> | undefined

/** True when `password` matches `hash`; with no hash, spends the same time and answers false. */
export async function verifyPassword(hash: string | null | undefined, password: string): Promise<boolean> {
  if (!hash) {
    decoyHash ??= hashPassword('decoy password that never matches anything')
    await argon2.verify(await decoyHash, password).catch(() => false)
    return false
  }
  try {
    return await argon2.verify(hash, password)
  } catch {
    return false
  }
}

/**
 * The password policy, shared by the server (which enforces it) and the client (which explains it
 * before submitting). Length first, no composition rules, and a refusal of the obvious — following
 * NIST SP 800-63B (2017), §5.1.1.2 "Memorized Secret Verifiers".
 */

/** Shortest accepted password, in characters. */
export const minPasswordLength = 12
/** Longest accepted password, in characters: room for long passphrases, a cap on hashing work. */
export const maxPasswordLength = 256

/**
 * A short built-in list of passwords that meet the length rule yet are among the first an attacker
 * tries (keyboard walks, digit runs, "password" variants) — common practice; compiled from memory.
 */
const commonPasswords = new Set([
  '123456789012',
  '1234567890123',
  '12345678901234',
  '123123123123',
  '111222333444',
  'password1234',
  'password12345',
  'password123456',
  'passwordpassword',
  'password1234567890',
  'qwertyuiopasdfgh',
  'qwertyuiop123',
  'qwerty123456',
  'qwertyqwerty',
  '1qaz2wsx3edc',
  '1q2w3e4r5t6y',
  'asdfghjkl123',
  'zxcvbnm12345',
  'iloveyou1234',
  'letmein12345',
  'welcome12345',
  'welcome123456',
  'changeme1234',
  'administrator',
  'administrator1',
  'abcdefghijkl',
  'abcdefghijklm',
  'abcd1234abcd',
  'abc123abc123',
  'trustno1trustno1',
  'monkey123456',
  'sunshine1234',
  'football1234',
  'baseball1234',
  'superman1234',
  'princess1234',
  'dragon123456',
  'master123456',
  'correcthorsebatterystaple',
  'cavitrace123',
  'cavitrace1234',
  'cavitracecavitrace',
])

/** Who the password is for, so it cannot simply be their own address or name. */
export interface PasswordContext {
  email?: string
  name?: string
}

function normalise(text: string): string {
  return text.toLowerCase().replace(/\s+/g, '')
}

/** Why `password` is refused, in one sentence, or null when it is acceptable. */
export function passwordProblem(password: string, context: PasswordContext = {}): string | null {
  const length = [...password].length
  if (length < minPasswordLength) return `Use at least ${minPasswordLength} characters; a few words strung together make a good password.`
  if (length > maxPasswordLength) return `Use at most ${maxPasswordLength} characters.`
  const plain = normalise(password)
  if (new Set([...plain]).size === 1) return 'A password made of one repeated character is too easy to guess.'
  if (commonPasswords.has(plain)) return 'This password is on the list of the most common passwords; choose another.'
  const email = normalise(context.email ?? '')
  const localPart = email.split('@')[0] ?? ''
  if (email && (plain === email || plain === localPart)) return 'A password must not be your e-mail address.'
  const name = normalise(context.name ?? '')
  if (name && plain === name) return 'A password must not be your name.'
  return null
}

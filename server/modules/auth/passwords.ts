import argon2 from 'argon2'
import { dictionary } from '@zxcvbn-ts/language-common'
import { normalisePassword, passwordProblems } from '../../../shared/passwords/policy.js'
import { ValidationError } from '../../lib/errors.js'

/**
 * argon2id with the package defaults (m = 64 MiB, t = 3, p = 4), above the OWASP Password Storage
 * Cheat Sheet minimum (m = 19 MiB, t = 2, p = 1). Passwords are NFKC-normalised before hashing.
 */
const HASH_OPTIONS = { type: argon2.argon2id, memoryCost: 65536, timeCost: 3, parallelism: 4 } as const

/**
 * The common-password list shipped with the app: the frequency-ranked list of passwords from public
 * breach corpora that the zxcvbn-ts project publishes in @zxcvbn-ts/language-common.
 */
const COMMON_PASSWORDS: ReadonlySet<string> = new Set(
  (dictionary['passwords-common'] as string[]).map((p) => p.toLowerCase()),
)

export const PRODUCT_CONTEXT_WORDS = ['Heardwell', 'heard well', 'heardwell.test', 'Coming Home After Stroke']

export async function hashPassword(password: string): Promise<string> {
  return argon2.hash(normalisePassword(password), HASH_OPTIONS)
}

export async function verifyPassword(hash: string, password: string): Promise<boolean> {
  try {
    return await argon2.verify(hash, normalisePassword(password))
  } catch {
    return false
  }
}

export function needsRehash(hash: string): boolean {
  return argon2.needsRehash(hash, HASH_OPTIONS)
}

/** A hash to verify against when the e-mail is unknown, so both answers take the same time. */
let dummyHash: Promise<string> | null = null
export function dummyVerify(password: string): Promise<boolean> {
  dummyHash ??= argon2.hash('an unknown account has no password at all', HASH_OPTIONS)
  return dummyHash.then((hash) => verifyPassword(hash, password)).then(() => false)
}

/** Throws a field error with every reason when the new password breaks the policy. */
export function assertAcceptablePassword(password: string, contextWords: string[], field = 'password'): void {
  const problems = passwordProblems({
    password,
    contextWords: [...PRODUCT_CONTEXT_WORDS, ...contextWords],
    commonPasswords: COMMON_PASSWORDS,
  })
  if (problems.length) {
    throw new ValidationError(problems[0]!, problems.map((message) => ({ path: field, message })))
  }
}

// scrypt parameters for password hashes, OWASP Password Storage Cheat Sheet (2023 and
// later): N = 2^17, r = 8, p = 1. One hash needs 128 × N × r = 128 MiB, so maxMemory is
// set above that and sign-in concurrency is bounded (server/utils/auth.ts).
export const SCRYPT_OPTIONS = {
  cost: 2 ** 17,
  blockSize: 8,
  parallelization: 1,
  keyLength: 64,
  saltSize: 16,
  maxMemory: 128 * 2 ** 17 * 8 * 2,
}

/**
 * The options new hashes are made with: SCRYPT_OPTIONS, unless NUXT_HASH_SCRYPT_COST names
 * another power of two from 2^14 up. That variable is Nuxt's own runtime override of the
 * server's `hash.scrypt.cost`, so the seed and the server always agree; the test run sets
 * 2^14 (16 MiB, tens of ms a hash) because hundreds of sign-ins at 2^17 dominate its time.
 * A hash carries its own parameters, so accounts made at either cost verify under both.
 */
export function scryptOptions(env: Record<string, string | undefined> = process.env) {
  const cost = Number(env.NUXT_HASH_SCRYPT_COST)
  if (!Number.isInteger(cost) || cost < 2 ** 14 || cost > 2 ** 20 || (cost & (cost - 1)) !== 0) return SCRYPT_OPTIONS
  return { ...SCRYPT_OPTIONS, cost, maxMemory: 128 * cost * 8 * 2 }
}

/** Passwords: at least 10 characters (NIST SP 800-63B allows 8; we ask a little more). */
export const PASSWORD_MIN_LENGTH = 10

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

/** Passwords: at least 10 characters (NIST SP 800-63B allows 8; we ask a little more). */
export const PASSWORD_MIN_LENGTH = 10

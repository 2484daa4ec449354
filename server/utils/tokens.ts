// One-time link tokens: 32 random bytes sent by mail; only their SHA-256 is stored.
import { createHash, randomBytes } from 'node:crypto'

export function newLinkToken() {
  const token = randomBytes(32).toString('base64url')
  return { token, hash: hashLinkToken(token) }
}

export function hashLinkToken(token: string) {
  return createHash('sha256').update(token).digest('hex')
}

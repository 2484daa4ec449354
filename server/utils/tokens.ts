// Random tokens: one-time links sent by mail and shared tablets' device cookies. 32 random
// bytes; only their SHA-256 is stored.
import { createHash, randomBytes } from 'node:crypto'

export function newLinkToken() {
  const token = randomBytes(32).toString('base64url')
  return { token, hash: hashLinkToken(token) }
}

export function hashLinkToken(token: string) {
  return createHash('sha256').update(token).digest('hex')
}

// The sealed-cookie password for nuxt-auth-utils: from the environment, or generated once
// into .data/session-secret so that sessions survive a restart of the local app.
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { randomBytes } from 'node:crypto'
import { join } from 'node:path'
import { root } from './config'

export function sessionSecret(env = process.env): string {
  if (env.NUXT_SESSION_PASSWORD) return env.NUXT_SESSION_PASSWORD
  const dir = join(root, env.SETLINE_DATA_DIR ?? '.data')
  const file = join(dir, 'session-secret')
  if (existsSync(file)) return readFileSync(file, 'utf8').trim()
  mkdirSync(dir, { recursive: true })
  const secret = randomBytes(32).toString('hex')
  writeFileSync(file, secret + '\n', { mode: 0o600 })
  return secret
}

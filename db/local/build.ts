// Builds the app when .output is missing or older than any source file.
import { existsSync, readdirSync, statSync } from 'node:fs'
import { join } from 'node:path'
import { spawnSync } from 'node:child_process'
import { root } from './config'

const SOURCES = ['app', 'server', 'shared', 'nuxt.config.ts', 'tailwind.config.ts', 'package-lock.json']

function newestMtime(path: string): number {
  if (!existsSync(path)) return 0
  const st = statSync(path)
  if (!st.isDirectory()) return st.mtimeMs
  let newest = st.mtimeMs
  for (const entry of readdirSync(path)) newest = Math.max(newest, newestMtime(join(path, entry)))
  return newest
}

export function buildIsStale(): boolean {
  const marker = join(root, '.output', 'nitro.json')
  if (!existsSync(marker)) return true
  const built = statSync(marker).mtimeMs
  return SOURCES.some(s => newestMtime(join(root, s)) > built)
}

export function buildIfStale(force = false) {
  if (!force && !buildIsStale()) return false
  console.log('setline: building the app (nuxt build, about a minute on 2 cores)…')
  const r = spawnSync('npx', ['nuxt', 'build'], {
    cwd: root, stdio: 'inherit', env: { ...process.env, NUXT_TELEMETRY_DISABLED: '1', NODE_ENV: 'production' },
  })
  if (r.status !== 0) throw new Error('nuxt build failed')
  return true
}

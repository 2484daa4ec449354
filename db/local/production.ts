// npm run serve: Setline for real, on a shop's server. No demo, no local cluster unless asked,
// no SMTP fake unless MAIL_FAKE=1: the app itself refuses to start without a mail relay
// (server/plugins/00.env.ts). Migrations are their own step (`npm run db:migrate`) and the build
// its own (`npm run build`): this start refuses to run on a database with migrations pending or
// without a build, instead of changing either. deploy/setline.service runs the same server
// under systemd, with `--check` (this script's checks only, then exit) before each start.
import { spawn } from 'node:child_process'
import { existsSync } from 'node:fs'
import { join } from 'node:path'
import { localDbSettings, root } from './config'
import { pendingMigrations } from './cluster'
import { sessionSecret } from './session-secret'

async function main() {
  const databaseUrl = process.env.DATABASE_URL ?? localDbSettings().url
  const entry = join(root, '.output/server/index.mjs')
  if (!existsSync(entry)) throw new Error('no build in .output: run `npm run build` first')
  const pending = await pendingMigrations(databaseUrl)
  if (pending.length) throw new Error(`the database has ${pending.length} migration(s) to apply (${pending.join(', ')}): run \`npm run db:migrate\` first`)
  if (process.argv.includes('--check')) return console.log('setline: build present, migrations up to date')
  const child = spawn(process.execPath, [entry], {
    cwd: root,
    stdio: 'inherit',
    env: {
      ...process.env,
      NODE_ENV: 'production',
      NUXT_TELEMETRY_DISABLED: '1',
      DATABASE_URL: databaseUrl,
      NUXT_SESSION_PASSWORD: sessionSecret(),
      MAIL_FAKE: process.env.MAIL_FAKE ?? '0',
    },
  })
  const stop = () => child.kill('SIGTERM')
  process.on('SIGINT', stop)
  process.on('SIGTERM', stop)
  child.on('exit', code => process.exit(code ?? 0))
}

main().catch((err) => {
  console.error(`setline: ${err instanceof Error ? err.message : err}`)
  process.exit(1)
})

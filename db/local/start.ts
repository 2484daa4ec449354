// npm start: local PostgreSQL → migrations → demo seed → build when stale → serve.
import { spawn } from 'node:child_process'
import { join } from 'node:path'
import { localDbSettings, root } from './config'
import { upCluster, migrate, seedIfEmpty } from './cluster'
import { buildIfStale } from './build'
import { sessionSecret } from './session-secret'
import { assertPortFree, demoSignIns, waitForHttp } from './serve'

const dev = process.argv.includes('--dev')
// SETLINE_DEMO=0: no demo rows; an empty database gets the first-run set-up (/setup) instead
const demo = !['0', 'false'].includes(process.env.SETLINE_DEMO ?? '1')
const t0 = Date.now()

async function main() {
  let databaseUrl = process.env.DATABASE_URL
  if (!databaseUrl) {
    const db = localDbSettings()
    const { cluster, created, started } = upCluster(db)
    console.log(`setline: PostgreSQL ${created ? 'created and ' : ''}${started ? 'started' : 'already running'} on 127.0.0.1:${db.port} (data: ${cluster.dataDir})`)
    databaseUrl = db.url
  }
  const done = await migrate(databaseUrl)
  console.log(`setline: migrations ${done.length ? `applied: ${done.join(', ')}` : 'up to date'}`)
  if (demo && await seedIfEmpty(databaseUrl)) console.log('setline: demo workshop seeded')

  const host = process.env.HOST ?? '127.0.0.1'
  const port = process.env.PORT ?? '3000'
  const env = {
    ...process.env,
    NUXT_TELEMETRY_DISABLED: '1',
    DATABASE_URL: databaseUrl,
    NUXT_SESSION_PASSWORD: sessionSecret(),
    MAIL_FAKE: process.env.MAIL_FAKE ?? (process.env.SMTP_HOST || process.env.SMTP_URL ? '0' : '1'),
    PAYMENTS_FAKE: process.env.PAYMENTS_FAKE ?? (process.env.PAYMENTS_SECRET_KEY ? '0' : '1'),
    HOST: host,
    PORT: port,
    APP_URL: process.env.APP_URL ?? `http://${host}:${port}`,
  }
  await assertPortFree(host, Number(port))
  if (!dev) buildIfStale()
  const child = dev
    ? spawn('npx', ['nuxt', 'dev', '--host', host, '--port', port], { cwd: root, env, stdio: 'inherit' })
    : spawn(process.execPath, [join(root, '.output/server/index.mjs')], { cwd: root, env, stdio: 'inherit' })
  await waitForHttp(`http://${host}:${port}/api/health`, 120_000, child)
  printWelcome(`http://${host}:${port}`)
  const stop = () => child.kill('SIGTERM')
  process.on('SIGINT', stop)
  process.on('SIGTERM', stop)
  child.on('exit', code => process.exit(code ?? 0))
}

function printWelcome(url: string) {
  console.log([
    '',
    `Setline is running at ${url}  (ready in ${((Date.now() - t0) / 1000).toFixed(1)} s)`,
    '',
    ...(demo ? demoSignIns() : ['Without the demo: a new database is set up at /setup with the code printed above.']),
    '',
    'Shared tablet: sign in as the lead on the device, People → "Use this device as a shared tablet",',
    'then tap a name and type that person\'s tablet PIN.',
    '',
    'Ctrl-C stops the app; `npm run db:stop` stops PostgreSQL.',
    '',
  ].join('\n'))
}

main().catch((err) => {
  console.error(`setline: ${err instanceof Error ? err.message : err}`)
  process.exit(1)
})

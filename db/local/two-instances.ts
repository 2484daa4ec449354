// npm run two-instances: the built app twice, on two ports, against the one local PostgreSQL
// (started, migrated and seeded as npm start does), to see live updates cross between
// instances: socket.io's PostgreSQL adapter passes every event through the database, and both
// instances share the session secret, so a sign-in on one works on the other. Instance A runs
// the SMTP fake; B's outbox worker sends to it (both workers take mail with SKIP LOCKED, so
// each message goes once). PORT (default 3000) and PORT_B (default PORT + 1) choose the ports.
import { spawn, type ChildProcess } from 'node:child_process'
import { createInterface } from 'node:readline'
import { join } from 'node:path'
import { localDbSettings, root } from './config'
import { upCluster, migrate, seedIfEmpty } from './cluster'
import { buildIfStale } from './build'
import { sessionSecret } from './session-secret'
import { assertPortFree, demoSignIns, waitForHttp } from './serve'

const host = process.env.HOST ?? '127.0.0.1'
const portA = Number(process.env.PORT ?? 3000)
const portB = Number(process.env.PORT_B ?? portA + 1)
const smtpPort = process.env.SMTP_PORT ?? '2525'

/** Runs one instance with its output prefixed by its name, so the two logs can be told apart. */
function instance(name: string, port: number, env: Record<string, string>): ChildProcess {
  const child = spawn(process.execPath, [join(root, '.output/server/index.mjs')], {
    cwd: root,
    env: { ...process.env, ...env, HOST: host, PORT: String(port), APP_URL: `http://${host}:${port}` },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  for (const stream of [child.stdout!, child.stderr!]) {
    createInterface({ input: stream }).on('line', line => console.log(`[${name}] ${line}`))
  }
  return child
}

async function main() {
  let databaseUrl = process.env.DATABASE_URL
  if (!databaseUrl) {
    const db = localDbSettings()
    upCluster(db)
    databaseUrl = db.url
  }
  await migrate(databaseUrl)
  if (await seedIfEmpty(databaseUrl)) console.log('setline: demo workshop seeded')
  for (const port of [portA, portB]) await assertPortFree(host, port)
  buildIfStale()
  const common = { NUXT_TELEMETRY_DISABLED: '1', DATABASE_URL: databaseUrl, NUXT_SESSION_PASSWORD: sessionSecret() }
  const useFake = !process.env.SMTP_HOST && !process.env.SMTP_URL
  const a = instance('A', portA, { ...common, MAIL_FAKE: useFake ? '1' : '0', SMTP_PORT: smtpPort })
  const b = instance('B', portB, { ...common, MAIL_FAKE: '0', SMTP_HOST: process.env.SMTP_HOST ?? '127.0.0.1', SMTP_PORT: smtpPort })
  const children = [a, b]
  const stop = () => children.forEach(c => c.exitCode === null && c.kill('SIGTERM'))
  process.on('SIGINT', stop)
  process.on('SIGTERM', stop)
  // when one instance ends, end the other and leave with its code
  for (const c of children) c.on('exit', (code) => {
    stop()
    process.exitCode = code ?? 0
  })
  const [urlA, urlB] = [`http://${host}:${portA}`, `http://${host}:${portB}`]
  await Promise.all([waitForHttp(`${urlA}/api/health`, 120_000, a), waitForHttp(`${urlB}/api/health`, 120_000, b)])
  console.log([
    '',
    'Setline is running twice on one database:',
    `  A  ${urlA}${useFake ? `  (SMTP fake on port ${smtpPort}: captured mail under /lead/mails here)` : ''}`,
    `  B  ${urlB}`,
    '',
    'Open the board on A and a caster\'s floor on B (or the other way round): a pour moved on one',
    'shows on the other at once. A session from either works on both.',
    '',
    ...demoSignIns(),
    '',
    'Ctrl-C stops both; `npm run db:stop` stops PostgreSQL.',
    '',
  ].join('\n'))
}

main().catch((err) => {
  console.error(`setline: ${err instanceof Error ? err.message : err}`)
  process.exit(1)
})

// npm run db:start | db:stop | db:migrate | db:seed
import { localDbSettings } from './config'
import { upCluster, downCluster, migrate, seedIfEmpty } from './cluster'

const cmd = process.argv[2]
const db = localDbSettings()
const url = process.env.DATABASE_URL ?? db.url

async function main() {
  switch (cmd) {
    case 'start': {
      const { cluster, started } = upCluster(db)
      console.log(`PostgreSQL ${started ? 'started' : 'already running'} on 127.0.0.1:${db.port} (data: ${cluster.dataDir})`)
      break
    }
    case 'stop':
      console.log(downCluster(db) ? 'PostgreSQL stopped' : 'PostgreSQL was not running')
      break
    case 'migrate': {
      if (!process.env.DATABASE_URL) upCluster(db)
      const done = await migrate(url)
      console.log(done.length ? `applied: ${done.join(', ')}` : 'migrations up to date')
      break
    }
    case 'seed':
      if (!process.env.DATABASE_URL) upCluster(db)
      await migrate(url)
      console.log(await seedIfEmpty(url) ? 'demo workshop seeded' : 'database already has a workshop: not seeded')
      break
    default:
      console.error('usage: tsx db/local/cli.ts start|stop|migrate|seed')
      process.exit(2)
  }
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err)
  process.exit(1)
})

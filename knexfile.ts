// knex CLI configuration: node --import tsx node_modules/knex/bin/cli.js migrate:latest --knexfile knexfile.ts
// The scripts in db/local call knex programmatically with the same settings.
import type { Knex } from 'knex'
import { localDbSettings } from './db/local/config'

export function knexConfig(url = process.env.DATABASE_URL ?? localDbSettings().url): Knex.Config {
  return {
    client: 'pg',
    connection: url,
    pool: { min: 0, max: 4 },
    migrations: { directory: './db/migrations', loadExtensions: ['.ts'], tableName: 'knex_migrations' },
    seeds: { directory: './db/seeds', loadExtensions: ['.ts'] },
  }
}

export default knexConfig()

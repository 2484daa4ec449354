// A test file's own database, cloned from the run's seeded template (PostgreSQL's CREATE
// DATABASE … TEMPLATE copies the files, about a tenth of a second): no file books around
// another's rows, and a file that fills its database slows nobody after it.
import { randomBytes } from 'node:crypto'
import pg from 'pg'

async function admin<T>(templateUrl: string, work: (c: pg.Client) => Promise<T>) {
  const url = new URL(templateUrl)
  url.pathname = '/postgres'
  const client = new pg.Client({ connectionString: url.toString() })
  await client.connect()
  try {
    return await work(client)
  }
  finally {
    await client.end()
  }
}

/** Clones the template into a fresh database; `drop` removes it, connections and all. */
export async function cloneFileDatabase(templateUrl: string) {
  const template = new URL(templateUrl).pathname.slice(1)
  const name = `setline_file_${randomBytes(6).toString('hex')}`
  await admin(templateUrl, c => c.query(`CREATE DATABASE "${name}" TEMPLATE "${template}"`))
  const databaseUrl = Object.assign(new URL(templateUrl), { pathname: `/${name}` }).toString()
  return {
    databaseUrl,
    // clean-up only: a backend PostgreSQL will not let this role end (seen once: a server's
    // connection still closing) leaves the database to the throwaway cluster's own removal
    drop: () => admin(templateUrl, c => c.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`)).catch((e: unknown) => {
      console.warn(`setline test: database ${name} left for the cluster's removal (${(e as Error).message})`)
    }),
  }
}

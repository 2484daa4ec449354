// The time zones PostgreSQL itself knows. The browser and Node check a zone with Intl, whose
// ICU data accepts names the database's tz files lack (SystemV/AST4, say); a workshop saved
// with one would make every query that says AT TIME ZONE fail until it was changed back. The
// list is read once per process: it changes only with the server's tz data (PostgreSQL manual,
// "pg_timezone_names"; zone names are matched without regard to case, as PostgreSQL does).
import type { Knex } from 'knex'

let known: Promise<Map<string, string>> | undefined

async function load(db: Knex) {
  const rows: { name: string }[] = (await db.raw('SELECT name FROM pg_timezone_names')).rows
  return new Map(rows.map(r => [r.name.toLowerCase(), r.name]))
}

export const timezonesRepo = {
  /** The database's own spelling of `zone`, or undefined when PostgreSQL does not know it. */
  async canonical(db: Knex, zone: string): Promise<string | undefined> {
    known ??= load(db).catch((err) => {
      known = undefined // not cached: the next request asks again
      throw err
    })
    return (await known).get(zone.toLowerCase())
  },
}

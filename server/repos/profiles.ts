// Every knex call for profiles: the named runs and enrichments moulds cast and items ask for.
import type { Knex } from 'knex'

export interface ProfileRow {
  id: number
  name: string
  moulds: number
  ready_moulds: number
}

export const profilesRepo = {
  /** Profiles by name, with how many moulds cast each and how many of those are ready. */
  list(db: Knex, workshopId: number): Promise<ProfileRow[]> {
    return db('profiles as p').leftJoin('moulds as m', function () {
      this.on('m.profile_id', 'p.id').andOn('m.workshop_id', 'p.workshop_id')
    }).where('p.workshop_id', workshopId)
      .groupBy('p.id', 'p.name')
      .select('p.id', 'p.name', db.raw('count(m.id)::int AS moulds'), db.raw(`count(m.id) FILTER (WHERE m.state = 'ready')::int AS ready_moulds`))
      .orderByRaw('lower(p.name)')
  },
  /** The profile of this name (any case), created when the workshop has none yet; its id. */
  async ensure(db: Knex, workshopId: number, name: string): Promise<number> {
    const clean = name.trim()
    await db.raw(`INSERT INTO profiles (workshop_id, name) VALUES (?, ?)
      ON CONFLICT (workshop_id, lower(name)) DO NOTHING`, [workshopId, clean])
    const row = await db('profiles').first('id').where({ workshop_id: workshopId }).whereRaw('lower(name) = lower(?)', [clean])
    return Number(row.id)
  },
  /** The id of the profile of this name (any case), or null: nothing is created. */
  async find(db: Knex, workshopId: number, name: string): Promise<number | null> {
    const row = await db('profiles').first('id').where({ workshop_id: workshopId }).whereRaw('lower(name) = lower(?)', [name.trim()])
    return row ? Number(row.id) : null
  },
  byId(db: Knex, workshopId: number, id: number): Promise<{ id: number; name: string } | undefined> {
    return db('profiles').first('id', 'name').where({ workshop_id: workshopId, id })
  },
}

// Every knex call for client_orgs (the client organisations a workshop deals with).
import type { Knex } from 'knex'

export const clientOrgsRepo = {
  async exists(db: Knex, workshopId: number, id: number): Promise<boolean> {
    return !!(await db('client_orgs').where({ workshop_id: workshopId, id }).first('id'))
  },
}

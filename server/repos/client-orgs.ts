// Every knex call for client_orgs (the client organisations a workshop deals with).
import type { Knex } from 'knex'
import { UNIQUE_LABELS, updateVersioned } from './versioned'

export const CLIENT_ORG_COLUMNS = ['id', 'name', 'notes', 'version'] as const
export interface ClientOrgRow { id: number; name: string; notes: string | null; version: number }
export type ClientOrgListRow = ClientOrgRow & { contact_count: number; site_count: number; job_count: number }
export interface ClientOrgInput { name?: string; notes?: string | null }

const toColumns = (i: ClientOrgInput) => ({
  ...(i.name !== undefined && { name: i.name }),
  ...(i.notes !== undefined && { notes: i.notes }),
})
const count = (table: string) => `(SELECT count(*)::int FROM ${table} x WHERE x.client_org_id = o.id AND x.workshop_id = o.workshop_id)`

export const clientOrgsRepo = {
  async exists(db: Knex, workshopId: number, id: number): Promise<boolean> {
    return !!(await db('client_orgs').where({ workshop_id: workshopId, id }).first('id'))
  },
  byId(db: Knex, workshopId: number, id: number): Promise<ClientOrgRow | undefined> {
    return db('client_orgs').first(CLIENT_ORG_COLUMNS).where({ workshop_id: workshopId, id })
  },
  list(db: Knex, workshopId: number): Promise<ClientOrgListRow[]> {
    return db('client_orgs as o').where('o.workshop_id', workshopId)
      .select(CLIENT_ORG_COLUMNS.map(c => `o.${c}`))
      .select(db.raw(`${count('client_contacts')} AS contact_count`), db.raw(`${count('client_sites')} AS site_count`), db.raw(`${count('jobs')} AS job_count`))
      .orderBy('o.name')
  },
  /** Organisation ids by lower-cased name (imports name the client in words). */
  async idsByName(db: Knex, workshopId: number): Promise<Map<string, number>> {
    const rows: { id: number; name: string }[] = await db('client_orgs').where({ workshop_id: workshopId }).select('id', 'name')
    return new Map(rows.map(r => [r.name.toLowerCase(), Number(r.id)]))
  },
  async insert(db: Knex, workshopId: number, input: ClientOrgInput): Promise<ClientOrgRow> {
    try {
      const [row] = await db('client_orgs').insert({ workshop_id: workshopId, ...toColumns(input) }).returning(CLIENT_ORG_COLUMNS)
      return row
    }
    catch (err) {
      rethrowDbError(err, UNIQUE_LABELS)
    }
  },
  /** Many organisations at once (an import); returns their ids by lower-cased name. */
  async insertMany(db: Knex, workshopId: number, rows: { name: string; notes: string | null }[]): Promise<Map<string, number>> {
    if (!rows.length) return new Map()
    const out: { id: number; name: string }[] = await db('client_orgs').insert(rows.map(r => ({ workshop_id: workshopId, ...r }))).returning(['id', 'name'])
    return new Map(out.map(r => [r.name.toLowerCase(), Number(r.id)]))
  },
  update(db: Knex, workshopId: number, id: number, version: number, input: ClientOrgInput): Promise<ClientOrgRow> {
    return updateVersioned<ClientOrgRow>(db, 'client_orgs', { workshopId, id, version }, toColumns(input), CLIENT_ORG_COLUMNS, 'Client')
  },
}

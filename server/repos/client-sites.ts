// Every knex call for client_sites: where a client's work goes (address, postcode and the
// access notes a delivery needs: opening hours, parking, lifting).
import type { Knex } from 'knex'
import { UNIQUE_LABELS, updateVersioned } from './versioned'

export const SITE_COLUMNS = ['id', 'client_org_id', 'name', 'address', 'postcode', 'opening_hours', 'parking', 'lifting', 'version'] as const
export interface SiteRow {
  id: number
  client_org_id: number
  name: string
  address: string
  postcode: string | null
  opening_hours: string | null
  parking: string | null
  lifting: string | null
  version: number
}
export interface SiteInput { name?: string; address?: string; postcode?: string | null; openingHours?: string | null; parking?: string | null; lifting?: string | null }

function toColumns(i: SiteInput) {
  const map: [keyof SiteInput, string][] = [['name', 'name'], ['address', 'address'], ['postcode', 'postcode'],
    ['openingHours', 'opening_hours'], ['parking', 'parking'], ['lifting', 'lifting']]
  return Object.fromEntries(map.filter(([k]) => i[k] !== undefined).map(([k, c]) => [c, i[k]]))
}

export const clientSitesRepo = {
  forOrg(db: Knex, workshopId: number, orgId: number): Promise<SiteRow[]> {
    return db('client_sites').select(SITE_COLUMNS).where({ workshop_id: workshopId, client_org_id: orgId }).orderBy(['name', 'id'])
  },
  list(db: Knex, workshopId: number): Promise<SiteRow[]> {
    return db('client_sites').select(SITE_COLUMNS).where({ workshop_id: workshopId }).orderBy(['name', 'id'])
  },
  byId(db: Knex, workshopId: number, id: number): Promise<SiteRow | undefined> {
    return db('client_sites').first(SITE_COLUMNS).where({ workshop_id: workshopId, id })
  },
  async insert(db: Knex, workshopId: number, orgId: number, input: SiteInput): Promise<SiteRow> {
    try {
      const [row] = await db('client_sites').insert({ workshop_id: workshopId, client_org_id: orgId, ...toColumns(input) }).returning(SITE_COLUMNS)
      return row
    }
    catch (err) {
      rethrowDbError(err, UNIQUE_LABELS)
    }
  },
  async insertMany(db: Knex, workshopId: number, rows: (SiteInput & { clientOrgId: number })[]) {
    for (let i = 0; i < rows.length; i += 500) {
      await db('client_sites').insert(rows.slice(i, i + 500).map(({ clientOrgId, ...r }) => ({ workshop_id: workshopId, client_org_id: clientOrgId, ...toColumns(r) })))
    }
  },
  update(db: Knex, workshopId: number, id: number, version: number, input: SiteInput): Promise<SiteRow> {
    return updateVersioned<SiteRow>(db, 'client_sites', { workshopId, id, version }, toColumns(input), SITE_COLUMNS, 'Site')
  },
}

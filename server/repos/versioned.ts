// Optimistic concurrency for rows with a `version` column: update only the version the caller
// saw, bump it, and tell "gone" (404) from "changed by someone else" (409).
import type { Knex } from 'knex'

export async function updateVersioned<T>(db: Knex, table: string, where: { workshopId: number; id: number; version: number }, patch: Record<string, unknown>, columns: readonly string[], what: string): Promise<T> {
  let rows: unknown[]
  try {
    rows = await db(table).where({ workshop_id: where.workshopId, id: where.id, version: where.version })
      .update({ ...patch, version: db.raw('version + 1'), updated_at: db.fn.now() }).returning(columns as string[])
  }
  catch (err) {
    rethrowDbError(err, UNIQUE_LABELS)
  }
  if (rows[0]) return rows[0] as T
  const exists = await db(table).where({ workshop_id: where.workshopId, id: where.id }).first('id')
  if (!exists) notFound(what)
  conflict(`This ${what.toLowerCase()} was changed by someone else; reload and try again`)
}

/** Labels for the unique constraints of the catalogue tables (knex names them table_cols_unique). */
export const UNIQUE_LABELS: Record<string, string> = {
  plaster_grades_workshop_id_name_unique: 'A plaster grade with this name already exists',
  plaster_lots_workshop_id_lot_code_unique: 'A lot with this lot code already exists',
  benches_workshop_id_name_unique: 'A bench with this name already exists',
  moulds_workshop_id_code_unique: 'A mould with this code already exists',
  jobs_workshop_id_code_unique: 'A job with this code already exists',
  client_orgs_workshop_id_name_unique: 'A client with this name already exists',
  client_contacts_org_email_unique: 'This client already has a contact with this e-mail',
  client_sites_workshop_id_client_org_id_name_unique: 'This client already has a site with this name',
}

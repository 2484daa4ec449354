// Every knex call for client_contacts: the people of a client organisation and which job mails
// each receives (progress, samples, dispatch and delivery, invoices). The recipients of a job's client
// mail are read here (server/services/notify.ts).
import type { Knex } from 'knex'
import { UNIQUE_LABELS, updateVersioned } from './versioned'

export const CONTACT_COLUMNS = ['id', 'client_org_id', 'name', 'email', 'phone', 'role', 'mail_progress', 'mail_samples', 'mail_dispatch', 'mail_invoices', 'version'] as const
export interface ContactRow {
  id: number
  client_org_id: number
  name: string
  email: string
  phone: string | null
  role: string | null
  mail_progress: boolean
  mail_samples: boolean
  mail_dispatch: boolean
  mail_invoices: boolean
  version: number
}
export interface ContactInput {
  name?: string
  email?: string
  phone?: string | null
  role?: string | null
  mailProgress?: boolean
  mailSamples?: boolean
  mailDispatch?: boolean
  mailInvoices?: boolean
}
export type ContactMail = 'mail_progress' | 'mail_samples' | 'mail_dispatch' | 'mail_invoices'

/** A contact who gets a job mail; user_id and notify_prefs when the contact is also a user of the workshop. */
export interface ContactRecipientRow { id: number; name: string; email: string; user_id: number | null; user_role: string | null; notify_prefs: unknown }

export function contactColumns(i: ContactInput) {
  const map: [keyof ContactInput, string][] = [['name', 'name'], ['email', 'email'], ['phone', 'phone'], ['role', 'role'],
    ['mailProgress', 'mail_progress'], ['mailSamples', 'mail_samples'], ['mailDispatch', 'mail_dispatch'], ['mailInvoices', 'mail_invoices']]
  return Object.fromEntries(map.filter(([k]) => i[k] !== undefined).map(([k, c]) => [c, i[k]]))
}

export const clientContactsRepo = {
  forOrg(db: Knex, workshopId: number, orgId: number): Promise<ContactRow[]> {
    return db('client_contacts').select(CONTACT_COLUMNS).where({ workshop_id: workshopId, client_org_id: orgId }).orderBy(['name', 'id'])
  },
  byId(db: Knex, workshopId: number, id: number): Promise<ContactRow | undefined> {
    return db('client_contacts').first(CONTACT_COLUMNS).where({ workshop_id: workshopId, id })
  },
  /** Lower-cased e-mails per organisation id (an import's duplicate check). */
  async emailsByOrg(db: Knex, workshopId: number): Promise<Map<number, Set<string>>> {
    const rows: { client_org_id: number; email: string }[] = await db('client_contacts').where({ workshop_id: workshopId }).select('client_org_id', 'email')
    const out = new Map<number, Set<string>>()
    for (const r of rows) {
      const id = Number(r.client_org_id)
      if (!out.has(id)) out.set(id, new Set())
      out.get(id)!.add(r.email.toLowerCase())
    }
    return out
  },
  async insert(db: Knex, workshopId: number, orgId: number, input: ContactInput): Promise<ContactRow> {
    try {
      const [row] = await db('client_contacts').insert({ workshop_id: workshopId, client_org_id: orgId, ...contactColumns(input) }).returning(CONTACT_COLUMNS)
      return row
    }
    catch (err) {
      rethrowDbError(err, UNIQUE_LABELS)
    }
  },
  /** Adds the contact unless the organisation already has one with this e-mail (a client member invited to a job). */
  ensure(db: Knex, workshopId: number, orgId: number, input: { name: string; email: string }) {
    return db('client_contacts').insert({ workshop_id: workshopId, client_org_id: orgId, name: input.name, email: input.email }).onConflict().ignore()
  },
  async insertMany(db: Knex, workshopId: number, rows: (ContactInput & { clientOrgId: number })[]) {
    for (let i = 0; i < rows.length; i += 500) {
      await db('client_contacts').insert(rows.slice(i, i + 500).map(({ clientOrgId, ...r }) => ({ workshop_id: workshopId, client_org_id: clientOrgId, ...contactColumns(r) })))
    }
  },
  update(db: Knex, workshopId: number, id: number, version: number, input: ContactInput): Promise<ContactRow> {
    return updateVersioned<ContactRow>(db, 'client_contacts', { workshopId, id, version }, contactColumns(input), CONTACT_COLUMNS, 'Contact')
  },
  async remove(db: Knex, workshopId: number, id: number): Promise<boolean> {
    return (await db('client_contacts').where({ workshop_id: workshopId, id }).del()) > 0
  },
  /**
   * The contacts of an organisation who get `mail`, each with the workshop's user of the same
   * e-mail when there is one (that person's own notification settings apply too). A disabled
   * user's contact gets nothing: the workshop took that person's access away.
   */
  recipients(db: Knex, workshopId: number, orgId: number, mail: ContactMail): Promise<ContactRecipientRow[]> {
    return db('client_contacts as c')
      .leftJoin('users as u', function () {
        this.on('u.workshop_id', 'c.workshop_id').andOn(db.raw('lower(u.email) = lower(c.email)'))
      })
      .where({ 'c.workshop_id': workshopId, 'c.client_org_id': orgId, [`c.${mail}`]: true })
      .whereNull('u.disabled_at')
      .select('c.id', 'c.name', 'c.email', 'u.id as user_id', 'u.role as user_role', 'u.notify_prefs')
      .orderBy('c.id')
  },
}

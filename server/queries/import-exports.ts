// The reads behind the CSV exports whose columns the import takes back (server/services/imports.ts):
// client contacts, client sites and the open jobs with their items, each scoped to the workshop.
import type { Knex } from 'knex'

export interface ContactExportRow { client: string; client_notes: string | null; name: string | null; email: string | null; phone: string | null; role: string | null; mail_progress: boolean | null; mail_samples: boolean | null; mail_dispatch: boolean | null; mail_invoices: boolean | null }
export interface SiteExportRow { client: string; name: string; address: string; postcode: string | null; opening_hours: string | null; parking: string | null; lifting: string | null }
export interface OpenJobItemExportRow {
  code: string
  title: string
  client: string | null
  site: string | null
  site_note: string | null
  due_on: string | null
  sample_required: boolean
  notes: string | null
  description: string | null
  mould: string | null
  profile: string | null
  quantity: number | null
  walls: { lengthM: number }[] | null
  min_piece_m: number | null
  spares_pct: number | null
  grade: string | null
  consistency: number | null
}

/** Every client with its contacts, one row per contact (a client without contacts: one row with the client alone). */
export function contactsExport(db: Knex, workshopId: number): Promise<ContactExportRow[]> {
  return db('client_orgs as o').leftJoin('client_contacts as c', function () {
    this.on('c.client_org_id', 'o.id').andOn('c.workshop_id', 'o.workshop_id')
  }).where('o.workshop_id', workshopId)
    .select('o.name as client', 'o.notes as client_notes', 'c.name', 'c.email', 'c.phone', 'c.role', 'c.mail_progress', 'c.mail_samples', 'c.mail_dispatch', 'c.mail_invoices')
    .orderBy(['o.name', 'c.name'])
}

export function sitesExport(db: Knex, workshopId: number): Promise<SiteExportRow[]> {
  return db('client_sites as s').join('client_orgs as o', function () {
    this.on('o.id', 's.client_org_id').andOn('o.workshop_id', 's.workshop_id')
  }).where('s.workshop_id', workshopId)
    .select('o.name as client', 's.name', 's.address', 's.postcode', 's.opening_hours', 's.parking', 's.lifting')
    .orderBy(['o.name', 's.name'])
}

/** The open and on-hold jobs, one row per item (a job without items: one row with the job alone). */
export function openJobsExport(db: Knex, workshopId: number): Promise<OpenJobItemExportRow[]> {
  return db('jobs as j')
    .leftJoin('client_orgs as o', function () {
      this.on('o.id', 'j.client_org_id').andOn('o.workshop_id', 'j.workshop_id')
    })
    .leftJoin('client_sites as s', function () {
      this.on('s.id', 'j.site_id').andOn('s.workshop_id', 'j.workshop_id')
    })
    .leftJoin('job_items as i', function () {
      this.on('i.job_id', 'j.id').andOn('i.workshop_id', 'j.workshop_id')
    })
    .leftJoin('moulds as m', function () {
      this.on('m.id', 'i.mould_id').andOn('m.workshop_id', 'j.workshop_id')
    })
    .leftJoin('plaster_grades as g', function () {
      this.on('g.id', 'i.grade_id').andOn('g.workshop_id', 'j.workshop_id')
    })
    .where('j.workshop_id', workshopId).whereIn('j.state', ['open', 'on_hold'])
    .select('j.code', 'j.title', 'o.name as client', 's.name as site', 'j.site as site_note', 'j.due_on', 'j.sample_required', 'j.notes',
      'i.description', 'm.code as mould', 'i.profile', 'i.quantity', 'i.walls', 'i.min_piece_m', 'i.spares_pct', 'g.name as grade', 'i.consistency')
    .orderBy(['j.code', 'i.sort_order', 'i.id'])
}

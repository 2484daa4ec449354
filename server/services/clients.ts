// Clients and sites (lead): client organisations, their contacts (who gets which job mail:
// progress, samples, dispatch and delivery; server/services/notify.ts reads them) and their
// sites (address and access notes for deliveries). The organisation's portal members are the
// client users of that organisation (users.client_org_id); a job's client access stays its
// job_members. Every read and write is scoped to the actor's workshop: another workshop's
// organisation, contact or site is a 404.
import type { Actor } from '../utils/auth'
import { clientOrgsRepo, type ClientOrgInput, type ClientOrgRow } from '../repos/client-orgs'
import { clientContactsRepo, type ContactInput, type ContactRow } from '../repos/client-contacts'
import { clientSitesRepo, type SiteInput, type SiteRow } from '../repos/client-sites'
import { usersRepo } from '../repos/users'
import { jobsRepo } from '../repos/jobs'
import type { ClientContact, ClientOrg, ClientOrgDetail, ClientOrgListEntry, ClientSite } from '#shared/types/clients'

const toOrg = (r: ClientOrgRow): ClientOrg => ({ id: r.id, name: r.name, notes: r.notes, version: r.version })

export const toContact = (r: ContactRow): ClientContact => ({
  id: r.id, clientOrgId: r.client_org_id, name: r.name, email: r.email, phone: r.phone, role: r.role,
  mailProgress: r.mail_progress, mailSamples: r.mail_samples, mailDispatch: r.mail_dispatch, mailInvoices: r.mail_invoices, version: r.version,
})

export const toSite = (r: SiteRow): ClientSite => ({
  id: r.id, clientOrgId: r.client_org_id, name: r.name, address: r.address, postcode: r.postcode,
  openingHours: r.opening_hours, parking: r.parking, lifting: r.lifting, version: r.version,
})

export async function listClients(actor: Actor): Promise<ClientOrgListEntry[]> {
  return (await clientOrgsRepo.list(useDb(), actor.workshopId)).map(r => ({
    ...toOrg(r), contactCount: r.contact_count, siteCount: r.site_count, jobCount: r.job_count,
  }))
}

export async function clientDetail(actor: Actor, id: number): Promise<ClientOrgDetail> {
  const db = useDb()
  const org = await clientOrgsRepo.byId(db, actor.workshopId, id)
  if (!org) notFound('Client')
  const [contacts, sites, members, jobs] = await Promise.all([
    clientContactsRepo.forOrg(db, actor.workshopId, id),
    clientSitesRepo.forOrg(db, actor.workshopId, id),
    usersRepo.orgMembers(db, actor.workshopId, id),
    jobsRepo.forOrg(db, actor.workshopId, id),
  ])
  return {
    ...toOrg(org), contacts: contacts.map(toContact), sites: sites.map(toSite),
    members: members.map(m => ({ id: m.id, name: m.name, email: m.email, disabled: !!m.disabled_at })),
    jobs: jobs.map(j => ({ id: j.id, code: j.code, title: j.title, state: j.state, siteName: j.site_name })),
  }
}

export async function createClient(actor: Actor, input: ClientOrgInput): Promise<ClientOrg> {
  return toOrg(await clientOrgsRepo.insert(useDb(), actor.workshopId, input))
}

export async function updateClient(actor: Actor, id: number, version: number, input: ClientOrgInput): Promise<ClientOrg> {
  return toOrg(await clientOrgsRepo.update(useDb(), actor.workshopId, id, version, input))
}

export async function addContact(actor: Actor, orgId: number, input: ContactInput): Promise<ClientContact> {
  const db = useDb()
  if (!(await clientOrgsRepo.exists(db, actor.workshopId, orgId))) notFound('Client')
  return toContact(await clientContactsRepo.insert(db, actor.workshopId, orgId, input))
}

export async function updateContact(actor: Actor, id: number, version: number, input: ContactInput): Promise<ClientContact> {
  return toContact(await clientContactsRepo.update(useDb(), actor.workshopId, id, version, input))
}

export async function removeContact(actor: Actor, id: number) {
  if (!(await clientContactsRepo.remove(useDb(), actor.workshopId, id))) notFound('Contact')
}

export async function addSite(actor: Actor, orgId: number, input: SiteInput): Promise<ClientSite> {
  const db = useDb()
  if (!(await clientOrgsRepo.exists(db, actor.workshopId, orgId))) notFound('Client')
  return toSite(await clientSitesRepo.insert(db, actor.workshopId, orgId, input))
}

export async function updateSite(actor: Actor, id: number, version: number, input: SiteInput): Promise<ClientSite> {
  return toSite(await clientSitesRepo.update(useDb(), actor.workshopId, id, version, input))
}

/** Every site of the workshop (the job form's choice, filtered there by the chosen client). */
export async function listSites(actor: Actor): Promise<ClientSite[]> {
  return (await clientSitesRepo.list(useDb(), actor.workshopId)).map(toSite)
}

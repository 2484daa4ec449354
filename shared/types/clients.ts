// What the client routes send (camelCase on the wire): client organisations with their
// contacts (which job mails each receives), sites (address and access notes) and portal members.

/** A client organisation as POST / PATCH /api/clients answer. */
export interface ClientOrg {
  id: number
  name: string
  notes: string | null
  version: number
}

/** GET /api/clients: every organisation with its counts. */
export type ClientOrgListEntry = ClientOrg & { contactCount: number; siteCount: number; jobCount: number }

export interface ClientContact {
  id: number
  clientOrgId: number
  name: string
  email: string
  phone: string | null
  role: string | null
  mailProgress: boolean
  mailSamples: boolean
  mailDispatch: boolean
  mailInvoices: boolean
  version: number
}

export interface ClientSite {
  id: number
  clientOrgId: number
  name: string
  address: string
  postcode: string | null
  openingHours: string | null
  parking: string | null
  lifting: string | null
  version: number
}

/** A portal member: a client user of the organisation. */
export interface ClientMember { id: number; name: string; email: string; disabled: boolean }

/** A job of the organisation, as its page lists it. */
export interface ClientOrgJob { id: number; code: string; title: string; state: string; siteName: string | null }

/** GET /api/clients/[id]: the organisation with its contacts, sites, portal members and jobs. */
export type ClientOrgDetail = ClientOrg & {
  contacts: ClientContact[]
  sites: ClientSite[]
  members: ClientMember[]
  jobs: ClientOrgJob[]
}

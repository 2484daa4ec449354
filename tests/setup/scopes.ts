// The three scopes of the access matrix (tests/api/route-table.ts): rows of the test's own in
// the demo workshop ("own"), the same kinds of row in a second workshop ("other"), and a job of
// the other client organisation in the demo workshop ("otherClient": ravi's, while the matrix's
// client is ada). Every row is made here, tagged, so the matrix never edits the demo's own rows.
// A new kind of row (a piece, a dispatch…): add it to KINDS with its table, to CLIENT_KINDS when
// it belongs to a client's job, a standing row to each scope below, and a maker to `fresh` for
// its `new…` kind when a route uses it up.
import { randomBytes, randomUUID } from 'node:crypto'
import { call } from './http'
import { demo, demoWorkshopId, testDb } from './fixtures'
import { jpegWithGps, photoForm } from './photo-fixtures'
import { plasterGradeFromPreset } from '#shared/utils/plaster'

export type ScopeName = 'own' | 'other' | 'otherClient'
export const SCOPES: ScopeName[] = ['own', 'other', 'otherClient']

/**
 * The rows a route can name. A `new…` kind is a fresh row for each call that should succeed
 * (a delete, a pour moved through the floor); refused calls get the scope's standing row.
 */
export const KINDS = {
  user: 'users', grade: 'plaster_grades', lot: 'plaster_lots', bench: 'benches', mould: 'moulds',
  job: 'jobs', sampleJob: 'jobs', decisionJob: 'jobs', item: 'job_items', member: 'users', pour: 'pours', photo: 'photos',
  piece: 'pieces', packedPiece: 'pieces', dispatch: 'dispatches', tablet: 'tablet_devices',
  newMould: 'moulds', newItem: 'job_items', newMember: 'users', newPour: 'pours', newPhoto: 'photos',
  newPiece: 'pieces', newPackedPiece: 'pieces', newTablet: 'tablet_devices',
  quote: 'quotes', sentQuote: 'quotes', newQuote: 'quotes', newSentQuote: 'quotes', acceptedQuote: 'quotes', newAcceptedQuote: 'quotes', invoice: 'invoices', newInvoice: 'invoices',
  depositJob: 'jobs', payment: 'payments', newPayment: 'payments',
  clientOrg: 'client_orgs', contact: 'client_contacts', site: 'client_sites', newContact: 'client_contacts',
  label: 'piece_labels',
  crate: 'crates', delivery: 'deliveries', newDelivery: 'deliveries', feed: 'calendar_feeds',
  consumable: 'consumables',
} as const
export type Kind = keyof typeof KINDS

/** Kinds that are the other client's in the otherClient scope; every other kind is the own row there. */
const CLIENT_KINDS = new Set<Kind>(['invoice', 'job', 'decisionJob', 'depositJob', 'item', 'member', 'photo', 'newItem', 'newMember', 'newPhoto'])

type Id = number | string
type Standing = Record<Exclude<Kind, `new${string}`>, Id>

/** What one request of a matrix cell may ask of its scope. */
export interface Scope {
  readonly name: ScopeName
  /** The id of the scope's row of this kind (the same row for the whole request). */
  id(kind: Kind): Promise<Id>
  /** The current version of the row `id(kind)` gives. */
  version(kind: Kind): Promise<number>
  /** The e-mail of a client of the scope's workshop who is on no job yet. */
  readonly clientEmail: string
}

export interface Scopes {
  /** A scope for one request; `succeed` makes `new…` kinds fresh rows. Records the kinds used. */
  request(name: ScopeName, succeed: boolean, used?: Set<Kind>): Scope
  /** Whether a request using these kinds names different rows in the scope than in own. */
  differs(name: ScopeName, used: Set<Kind>): boolean
  /** Text that must never show in an answer to the demo (other) or to the demo's client (otherClient). */
  markers: Record<'other' | 'otherClient', string[]>
  /** Takes the demo's clients off the matrix's jobs again (other tests list a client's jobs). */
  cleanup(): Promise<void>
}

const rnd = () => randomUUID().slice(0, 6)

/** A plaster grade row from a preset (the columns the catalogue's tests insert). */
function gradeRow(workshopId: number, name: string) {
  const g = plasterGradeFromPreset('beta-fibrous')
  return {
    workshop_id: workshopId, name, form: g.form, powder_density: g.powderDensity,
    consistency_min: g.consistency.min, consistency_max: g.consistency.max, consistency_default: g.consistency.default,
    demould_minutes_ref: g.demouldMinutesRef, set_time_water_exponent: g.setTimeWaterExponent,
    temperature_factors: JSON.stringify(g.temperatureFactors), hydration_heat: g.hydrationHeat,
    set_expansion_pct: g.setExpansionPct, purity: g.purity,
  }
}

/** Builds every scope's rows. `lead` is the demo lead's cookie (pours and photos go through the API). */
export async function makeScopes(lead: string): Promise<Scopes> {
  const k = testDb()
  const ws = await demoWorkshopId()
  const tags = { own: `mx${rnd()}`, other: `ox${rnd()}`, otherClient: `cx${rnd()}` }
  const insert = async (table: string, row: Record<string, unknown>) => Number((await k(table).insert(row).returning('id'))[0].id)
  const userId = (email: string) => k('users').where({ email }).first('id').then(r => Number(r.id))
  const [client1, client2] = [await userId(demo.client1.email), await userId(demo.client2.email)]
  let n = 0
  const person = (workshopId: number, role: string, tag: string) =>
    insert('users', { workshop_id: workshopId, role, email: `${tag}-${++n}-${rnd()}@matrix.example.test`, name: `Matrix ${role} ${n}` })

  // own: the demo workshop, with ada (client1) on the job
  const bench = await insert('benches', { workshop_id: ws, name: `Bench ${tags.own}`, sort_order: 95 })
  const grade = await insert('plaster_grades', gradeRow(ws, `Grade ${tags.own}`))
  const mouldRow = () => insert('moulds', { workshop_id: ws, bench_id: bench, code: `${tags.own}-M${++n}`, casts: 'Matrix cast', material: 'silicone', cavity_litres: 1, max_dwell_minutes: 240 })
  const jobRow = async (workshopId: number, tag: string, row: Record<string, unknown>, member?: number) => {
    const id = await insert('jobs', { workshop_id: workshopId, code: `${tag}-J${++n}`, title: `Matrix job ${tag}`, ...row })
    if (member) await k('job_members').insert({ workshop_id: workshopId, job_id: id, user_id: member })
    return id
  }
  const itemRow = (workshopId: number, jobId: number, gradeId: number) =>
    insert('job_items', { workshop_id: workshopId, job_id: jobId, description: 'Matrix item', profile: 'Matrix', quantity: 1, pieces_needed: 1, grade_id: gradeId, consistency: 70 })
  const memberRow = async (workshopId: number, jobId: number, tag: string) => {
    const id = await person(workshopId, 'client', tag)
    await k('job_members').insert({ workshop_id: workshopId, job_id: jobId, user_id: id })
    return id
  }
  // a planned pour through the API on a mould of its own, so the slot is always free
  const pourRow = async () => {
    const r = await call('/api/pours', { method: 'POST', cookie: lead, body: { mouldId: await mouldRow(), slotStart: '2027-09-13T09:00:00Z' } })
    if (r.status !== 201) throw new Error(`matrix pour: ${r.status} ${JSON.stringify(r.data)}`)
    return Number(r.data.id)
  }
  const photoRow = async (jobId: number, shared: boolean) => {
    const r = await call(`/api/jobs/${jobId}/photos`, { method: 'POST', cookie: lead, form: photoForm([{ name: 'matrix.jpg', data: await jpegWithGps(64, 48) }], { shared: String(shared) }) })
    if (r.status !== 201) throw new Error(`matrix photo: ${r.status} ${JSON.stringify(r.data)}`)
    return r.data[0].id as string
  }
  /** A piece of the job item `itemId` (on a pour of its own), straight in the database: the finishing tests drive the steps. */
  const pieceRow = async (workshopId: number, tag: string, itemId: number, state: string, pourId?: number) => insert('pieces', {
    workshop_id: workshopId, pour_id: pourId ?? await pourRow(), job_item_id: itemId, mark: `${tag}-P${++n}`, state, dry_mass_kg: 1.2, wet_mass_kg: 1.8,
  })
  /** A quote with one revision in `status`, straight in the database (a one-room take-off priced at nothing). */
  // in the demo workshop the quotes are for ada's organisation (the matrix's client), elsewhere for one of their own
  const adaOrg = Number((await k('users').where({ id: client1 }).first('client_org_id')).client_org_id)
  const quoteRow = async (workshopId: number, tag: string, status: 'draft' | 'sent' | 'accepted') => {
    const org = workshopId === ws ? adaOrg : await insert('client_orgs', { workshop_id: workshopId, name: `Client ${tag} ${++n}` })
    const id = await insert('quotes', { workshop_id: workshopId, number: 9000 + ++n, title: `Quote ${tag}`, client_org_id: org })
    const takeOff = { rooms: [{ name: `Room ${tag}`, runs: [], ornaments: [{ name: 'Patera', count: 1, plasterKgEach: 1, newMould: false }] }], bagKg: 25, deliveries: 0, fixing: false }
    await k('quote_versions').insert({ workshop_id: workshopId, quote_id: id, revision: 1, status, take_off: JSON.stringify(takeOff), lines: '[]', currency: 'GBP', net: 0, tax: 0, total: 0, estimate: 0, deposit: 0 })
    return id
  }
  /** An issued invoice on the job, straight in the database. */
  const invoiceRow = (workshopId: number, jobId: number) => insert('invoices', {
    workshop_id: workshopId, job_id: jobId, number: 9000 + ++n, stage: 'Matrix stage', lines: JSON.stringify([{ description: 'Cast', quantity: 1, unitPrice: 1000, amount: 1000 }]),
    currency: 'GBP', net: 1000, tax: 0, total: 1000, deposit_credit: 0, amount_due: 1000,
  })
  /** A paid bank transfer on the job, straight in the database. */
  const paymentRow = (workshopId: number, jobId: number) => insert('payments', { workshop_id: workshopId, job_id: jobId, amount: 1000, currency: 'GBP', method: 'bank_transfer', status: 'paid', paid_at: new Date() })
  /** A piece's live label; its id for a route is the token its QR code carries. */
  const labelRow = async (workshopId: number, pieceId: Id) => {
    const token = randomBytes(16).toString('base64url')
    await k('piece_labels').insert({ workshop_id: workshopId, piece_id: pieceId, token })
    return token
  }
  const tabletRow = (workshopId: number, tag: string) => insert('tablet_devices', { workshop_id: workshopId, name: `Tablet ${tag}`, token_hash: `matrix-${randomUUID()}` })
  const orgRow = (workshopId: number, tag: string) => insert('client_orgs', { workshop_id: workshopId, name: `Client ${tag}` })
  const contactRow = (workshopId: number, orgId: number, tag: string) => insert('client_contacts', { workshop_id: workshopId, client_org_id: orgId, name: `Contact ${tag}`, email: `${tag}-${++n}@contact.example.test` })
  const siteRow = (workshopId: number, orgId: number, tag: string) => insert('client_sites', { workshop_id: workshopId, client_org_id: orgId, name: `Site ${tag}`, address: `1 ${tag} Street` })
  const crateRow = (workshopId: number, jobId: number) => insert('crates', { workshop_id: workshopId, job_id: jobId, crate_no: ++n })
  /** A booked delivery of the job, carrying `pieceId` loose when given. */
  const deliveryRow = async (workshopId: number, jobId: number, pieceId?: number) => {
    const id = await insert('deliveries', { workshop_id: workshopId, job_id: jobId, delivery_day: '2027-09-20', vehicle: 'Matrix van' })
    if (pieceId) await k('delivery_pieces').insert({ workshop_id: workshopId, delivery_id: id, piece_id: pieceId })
    return id
  }
  const feedRow = (workshopId: number) => insert('calendar_feeds', { workshop_id: workshopId, token_hash: `matrix-${randomUUID()}` })
  const ownOrg = await orgRow(ws, tags.own)
  const job = await jobRow(ws, tags.own, {}, client1)
  const ownItem = await itemRow(ws, job, grade)
  const own: Standing = {
    user: await person(ws, 'caster', tags.own), grade, bench,
    lot: await insert('plaster_lots', { workshop_id: ws, grade_id: grade, lot_code: `${tags.own}-L`, bags_received: 3, bag_kg: 25, received_on: '2026-12-01' }),
    mould: await mouldRow(), job, item: ownItem, member: await memberRow(ws, job, tags.own),
    piece: await pieceRow(ws, tags.own, ownItem, 'to_fettle'), packedPiece: await pieceRow(ws, tags.own, ownItem, 'packed'),
    dispatch: await insert('dispatches', { workshop_id: ws, job_id: job, note_no: `${tags.own}-DN`, dispatched_at: new Date() }),
    tablet: await tabletRow(ws, tags.own),
    sampleJob: await jobRow(ws, tags.own, { sample_required: true, sample_state: 'awaiting_cast' }),
    decisionJob: await jobRow(ws, tags.own, { sample_required: true, sample_state: 'awaiting_approval' }, client1),
    pour: await pourRow(), photo: await photoRow(job, true),
    quote: await quoteRow(ws, tags.own, 'draft'), sentQuote: await quoteRow(ws, tags.own, 'sent'), acceptedQuote: await quoteRow(ws, tags.own, 'accepted'),
    // asks a deposit, so ada has something to pay by card
    depositJob: await jobRow(ws, tags.own, { deposit_minor: 5000 }, client1), payment: await paymentRow(ws, job), invoice: await invoiceRow(ws, job),
    clientOrg: ownOrg, contact: await contactRow(ws, ownOrg, tags.own), site: await siteRow(ws, ownOrg, tags.own), label: '',
    crate: await crateRow(ws, job), delivery: await deliveryRow(ws, job), feed: await feedRow(ws),
    consumable: await insert('consumables', { workshop_id: ws, name: `Scrim ${tags.own}`, unit: 'm2' }),
  }
  own.label = await labelRow(ws, own.piece)

  // otherClient: a job of Quayside Interiors (ravi, client2) in the demo workshop
  const job2 = await jobRow(ws, tags.otherClient, {}, client2)
  const decision2 = await jobRow(ws, tags.otherClient, { sample_required: true, sample_state: 'awaiting_approval' }, client2)
  const item2 = await itemRow(ws, job2, grade)
  const otherClient: Standing = {
    ...own, job: job2, decisionJob: decision2, item: item2, member: await memberRow(ws, job2, tags.otherClient),
    photo: await photoRow(job2, true), packedPiece: await pieceRow(ws, tags.otherClient, item2, 'packed'),
    depositJob: await jobRow(ws, tags.otherClient, { deposit_minor: 5000 }, client2), invoice: await invoiceRow(ws, job2),
  }

  // other: a second workshop, whose client is on its job; its pour and photo are rows only.
  // Nobody signs in there, so its people need no password (scrypt is slow on purpose).
  const ow = await insert('workshops', { name: `Workshop ${tags.other}` })
  const email = async (id: number) => (await k('users').where({ id }).first('email')).email as string
  await person(ow, 'lead', tags.other)
  const [oCaster, oClient] = [await person(ow, 'caster', tags.other), await person(ow, 'client', tags.other)]
  const oGrade = await insert('plaster_grades', gradeRow(ow, `Grade ${tags.other}`))
  const oMould = await insert('moulds', { workshop_id: ow, code: `${tags.other}-M`, casts: 'Other cast', material: 'silicone', cavity_litres: 1 })
  const oJob = await jobRow(ow, tags.other, { sample_required: true, sample_state: 'awaiting_approval' }, oClient)
  const slot = ['2027-09-13T08:00:00Z', '2027-09-13T10:00:00Z']
  const oPour = await insert('pours', {
    workshop_id: ow, mould_id: oMould, grade_id: oGrade, consistency: 70, slot: k.raw('tstzrange(?, ?)', slot),
    mix_at: '2027-09-13T08:10:00Z', demould_open_at: '2027-09-13T09:00:00Z', demould_close_at: '2027-09-13T09:30:00Z',
    plaster_kg_planned: 1.4, water_kg_planned: 1,
  })
  // the photo row points at the own photo's files, so a leak would serve real bytes
  const files = await k('photos').where({ id: own.photo }).first('thumb_key', 'display_key', 'width', 'height', 'bytes')
  const oPhoto = (await k('photos').insert({ workshop_id: ow, job_id: oJob, shared: true, caption: `Photo ${tags.other}`, ...files }).returning('id'))[0].id as string
  const otherRows: Standing = {
    user: oCaster, grade: oGrade, mould: oMould, job: oJob, sampleJob: oJob, decisionJob: oJob, pour: oPour, photo: oPhoto,
    lot: await insert('plaster_lots', { workshop_id: ow, grade_id: oGrade, lot_code: `${tags.other}-L`, bags_received: 3, bag_kg: 25, received_on: '2026-12-01' }),
    bench: await insert('benches', { workshop_id: ow, name: `Bench ${tags.other}` }),
    item: 0, member: oClient, tablet: await tabletRow(ow, tags.other),
    dispatch: await insert('dispatches', { workshop_id: ow, job_id: oJob, note_no: `${tags.other}-DN`, dispatched_at: new Date() }),
    piece: 0, packedPiece: 0,
    quote: await quoteRow(ow, tags.other, 'draft'), sentQuote: await quoteRow(ow, tags.other, 'sent'), acceptedQuote: await quoteRow(ow, tags.other, 'accepted'),
    depositJob: await jobRow(ow, tags.other, { deposit_minor: 5000 }, oClient), payment: 0, invoice: 0,
    clientOrg: 0, contact: 0, site: 0, label: '',
    crate: await crateRow(ow, oJob), delivery: await deliveryRow(ow, oJob), feed: await feedRow(ow),
    consumable: await insert('consumables', { workshop_id: ow, name: `Scrim ${tags.other}`, unit: 'm2' }),
  }
  otherRows.clientOrg = await orgRow(ow, tags.other)
  otherRows.contact = await contactRow(ow, otherRows.clientOrg as number, tags.other)
  otherRows.site = await siteRow(ow, otherRows.clientOrg as number, tags.other)
  otherRows.item = await itemRow(ow, oJob, oGrade)
  otherRows.piece = await pieceRow(ow, tags.other, otherRows.item as number, 'to_fettle', oPour)
  otherRows.packedPiece = otherRows.piece
  otherRows.label = await labelRow(ow, otherRows.piece)
  otherRows.payment = await paymentRow(ow, oJob)
  otherRows.invoice = await invoiceRow(ow, oJob)
  const standing: Record<ScopeName, Standing> = { own, other: otherRows, otherClient }
  const emails = { own: await email(await person(ws, 'client', tags.own)), other: await email(oClient) }

  const fresh: Partial<Record<Kind, (s: ScopeName) => Promise<Id>>> = {
    newMould: () => mouldRow(),
    newItem: s => itemRow(ws, standing[s].job as number, grade),
    newMember: s => memberRow(ws, standing[s].job as number, tags[s]),
    newPour: () => pourRow(),
    newPhoto: s => photoRow(standing[s].job as number, false),
    newPiece: s => pieceRow(ws, tags[s], standing[s].item as number, 'to_fettle'),
    newPackedPiece: s => pieceRow(ws, tags[s], standing[s].item as number, 'packed'),
    newTablet: s => tabletRow(ws, tags[s]),
    newQuote: s => quoteRow(ws, tags[s], 'draft'),
    newSentQuote: s => quoteRow(ws, tags[s], 'sent'),
    newAcceptedQuote: s => quoteRow(ws, tags[s], 'accepted'),
    newPayment: s => paymentRow(ws, standing[s].job as number),
    newInvoice: s => invoiceRow(ws, standing[s].job as number),
    newContact: s => contactRow(ws, ownOrg, tags[s]),
    newDelivery: async s => deliveryRow(ws, standing[s].job as number, await pieceRow(ws, tags[s], standing[s].item as number, 'packed')),
  }
  const standingKind = (kind: Kind) => (kind.startsWith('new') ? kind[3]!.toLowerCase() + kind.slice(4) : kind) as keyof Standing

  return {
    request(name, succeed, used = new Set()) {
      const memo = new Map<Kind, Promise<Id>>()
      const id = (kind: Kind) => {
        used.add(kind)
        if (!memo.has(kind)) {
          memo.set(kind, kind.startsWith('new') && succeed && name !== 'other' ? fresh[kind]!(name) : Promise.resolve(standing[name][standingKind(kind)]))
        }
        return memo.get(kind)!
      }
      return {
        name, id, clientEmail: name === 'other' ? emails.other : emails.own,
        version: async (kind: Kind) => Number((await k(KINDS[kind]).where({ id: await id(kind) }).first('version')).version),
      }
    },
    differs: (name, used) => name === 'other' ? used.size > 0 : [...used].some(kind => CLIENT_KINDS.has(kind)),
    markers: {
      other: [tags.other],
      otherClient: [tags.otherClient, demo.client2.email, 'J-2602'],
    },
    async cleanup() {
      await k('job_members').whereIn('user_id', [client1, client2]).whereIn('job_id', [job, job2, own.decisionJob as number, decision2]).del()
      // the other workshop's photo row shares the own photo's files: photos.test counts files per row
      await k('photos').where({ id: oPhoto }).del()
    },
  }
}

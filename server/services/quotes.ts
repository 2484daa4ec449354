// The workshop's rates and its quotes: a take-off priced at the current rates (pure model in
// shared/utils/quote-pricing.ts, exact money in shared/utils/money.ts). A draft revision is
// repriced whenever it is edited; a sent revision is frozen, and a change makes the next
// revision (the sent one is then superseded). Every step is one transaction.
import type { Knex } from 'knex'
import { ratesRepo, type RatesColumns, type RatesRow } from '../repos/rates'
import { quotesRepo, type QuoteFigures, type QuoteRow, type QuoteVersionRow } from '../repos/quotes'
import { clientOrgsRepo } from '../repos/client-orgs'
import { isoOrNull } from './catalogue'
import { usersRepo } from '../repos/users'
import { recordEvent } from '../repos/events'
import type { Actor } from '../utils/auth'
import { notifyQuoteDecision, notifyQuoteSent } from './notify'
import { formatMoney, percentToBasisPoints } from '#shared/utils/money'
import { depositFor, priceQuote, takeOff, type QuoteLine, type WorkshopRates } from '#shared/utils/quote-pricing'
import type { TakeOffInput } from '#shared/utils/quote-schemas'
import type { ClientQuote, ClientQuoteSummary, Quote, QuoteRevision, QuoteSummary, Rates } from '#shared/types/quotes'

const pct = (bp: number) => bp / 100

function toRates(r: RatesRow): Rates {
  return {
    currency: r.currency, plasterPerBag: r.plaster_per_bag, mouldPerProfile: r.mould_per_profile,
    castPerLength: r.cast_per_length, castPerPiece: r.cast_per_piece, fettlePerPiece: r.fettle_per_piece,
    fixPerMetre: r.fix_per_metre, deliveryPerTrip: r.delivery_per_trip,
    marginPct: pct(r.margin_bp), taxPct: pct(r.tax_bp), depositPct: pct(r.deposit_bp), labourPerHour: r.labour_per_hour, version: r.version,
  }
}

export async function getRates(workshopId: number): Promise<Rates> {
  return toRates(await ratesRepo.get(useDb(), workshopId))
}

export async function putRates(workshopId: number, version: number, input: Omit<Rates, 'version' | 'labourPerHour'> & { labourPerHour?: number }): Promise<Rates> {
  const patch: RatesColumns = {
    currency: input.currency, plaster_per_bag: input.plasterPerBag, mould_per_profile: input.mouldPerProfile,
    cast_per_length: input.castPerLength, cast_per_piece: input.castPerPiece, fettle_per_piece: input.fettlePerPiece,
    fix_per_metre: input.fixPerMetre, delivery_per_trip: input.deliveryPerTrip,
    margin_bp: percentToBasisPoints(input.marginPct, 'marginPct'), tax_bp: percentToBasisPoints(input.taxPct, 'taxPct'),
    deposit_bp: percentToBasisPoints(input.depositPct, 'depositPct'),
    ...(input.labourPerHour === undefined ? {} : { labour_per_hour: input.labourPerHour }),
  }
  return useDb().transaction(async trx => toRates(await ratesRepo.update(trx, workshopId, version, patch)))
}

/** The take-off priced at the workshop's current rates. */
function price(r: RatesRow, t: TakeOffInput): QuoteFigures {
  const rates: WorkshopRates = {
    plasterPerBag: r.plaster_per_bag, mouldPerProfile: r.mould_per_profile, castPerLength: r.cast_per_length,
    castPerPiece: r.cast_per_piece, fettlePerPiece: r.fettle_per_piece, fixPerMetre: r.fix_per_metre,
    deliveryPerTrip: r.delivery_per_trip, marginBp: r.margin_bp, taxBp: r.tax_bp,
  }
  const q = priceQuote(takeOff(t.rooms, t.bagKg), rates, { deliveries: t.deliveries, fixing: t.fixing })
  return { take_off: t, lines: q.lines, currency: r.currency, net: q.net, tax: q.tax, total: q.total, estimate: q.estimate, deposit: depositFor(q.total, r.deposit_bp) }
}

export const quoteNumber = (n: number) => `Q-${String(n).padStart(4, '0')}`

function toRevision(v: QuoteVersionRow): QuoteRevision {
  return {
    revision: v.revision, status: v.status, takeOff: v.take_off as TakeOffInput, lines: v.lines as QuoteLine[],
    currency: v.currency, net: v.net, tax: v.tax, total: v.total, estimate: v.estimate, deposit: v.deposit,
    sentAt: isoOrNull(v.sent_at), decidedAt: isoOrNull(v.decided_at), decisionComment: v.decision_comment,
    createdAt: v.created_at.toISOString(),
  }
}

async function readQuote(db: Knex, workshopId: number, id: number): Promise<Quote> {
  const q = await quotesRepo.byId(db, workshopId, id)
  if (!q) notFound('Quote')
  return toQuote(q, await quotesRepo.revisions(db, workshopId, id))
}

function toQuote(q: QuoteRow, revisions: QuoteVersionRow[]): Quote {
  return {
    id: q.id, number: quoteNumber(q.number), title: q.title, clientOrgId: q.client_org_id, clientName: q.client_name,
    jobId: q.job_id, version: q.version, revisions: revisions.map(toRevision),
  }
}

export async function listQuotes(workshopId: number): Promise<QuoteSummary[]> {
  return (await quotesRepo.list(useDb(), workshopId)).map(q => ({
    id: q.id, number: quoteNumber(q.number), title: q.title, clientName: q.client_name, revision: q.revision,
    status: q.status, currency: q.currency, total: q.total, updatedAt: q.updated_at.toISOString(),
  }))
}

export function getQuote(workshopId: number, id: number): Promise<Quote> {
  return readQuote(useDb(), workshopId, id)
}

async function checkClient(db: Knex, workshopId: number, clientOrgId: number | null | undefined) {
  if (clientOrgId != null && !(await clientOrgsRepo.exists(db, workshopId, clientOrgId))) {
    unprocessable([{ field: 'clientOrgId', message: 'Client is not one of this workshop\'s clients' }])
  }
}

export async function createQuote(workshopId: number, input: { title: string; clientOrgId?: number | null; takeOff: TakeOffInput }): Promise<Quote> {
  return useDb().transaction(async (trx) => {
    await checkClient(trx, workshopId, input.clientOrgId)
    const figures = price(await ratesRepo.get(trx, workshopId), input.takeOff)
    const id = await quotesRepo.insert(trx, workshopId, { title: input.title, clientOrgId: input.clientOrgId ?? null })
    await quotesRepo.insertRevision(trx, workshopId, id, 1, figures)
    return readQuote(trx, workshopId, id)
  })
}

async function latestOf(db: Knex, workshopId: number, id: number): Promise<QuoteVersionRow> {
  const latest = await quotesRepo.latest(db, workshopId, id)
  if (!latest) notFound('Quote')
  return latest
}

/** Edits the quote's draft revision (repriced at today's rates); a sent revision is never edited. */
export async function updateQuote(workshopId: number, id: number, version: number, input: { title?: string; clientOrgId?: number | null; takeOff?: TakeOffInput }): Promise<Quote> {
  return useDb().transaction(async (trx) => {
    const latest = await latestOf(trx, workshopId, id)
    if (input.takeOff && latest.status !== 'draft') {
      conflict(`Revision ${latest.revision} has been sent and is never edited; make a new revision to change it`)
    }
    await checkClient(trx, workshopId, input.clientOrgId)
    await quotesRepo.touch(trx, workshopId, id, version, {
      ...(input.title !== undefined && { title: input.title }),
      ...(input.clientOrgId !== undefined && { client_org_id: input.clientOrgId }),
    })
    if (input.takeOff) await quotesRepo.updateDraft(trx, workshopId, latest.id, price(await ratesRepo.get(trx, workshopId), input.takeOff))
    return readQuote(trx, workshopId, id)
  })
}

/** Sends the draft revision: from now on it is frozen. */
export async function sendQuote(workshopId: number, id: number, version: number, actorId: number): Promise<Quote> {
  const quote = await useDb().transaction(async (trx) => {
    const latest = await latestOf(trx, workshopId, id)
    const q = await quotesRepo.byId(trx, workshopId, id)
    if (!q?.client_org_id) unprocessable([{ field: 'clientOrgId', message: 'Choose the client before sending the quote' }])
    await quotesRepo.touch(trx, workshopId, id, version, {})
    if (!(await quotesRepo.setStatus(trx, workshopId, latest.id, ['draft'], 'sent', { sent: true }))) {
      conflict(`Revision ${latest.revision} has already been sent`)
    }
    await recordEvent(trx, { workshopId, entity: 'quote', entityId: id, type: 'quote.sent', actorId, data: { revision: latest.revision, total: latest.total } })
    await notifyQuoteSent(trx, workshopId, { id, number: quoteNumber(q.number), title: q.title, revision: latest.revision, total: formatMoney(latest.total, latest.currency), clientOrgId: q.client_org_id })
    return readQuote(trx, workshopId, id)
  })
  void deliverDueMail().catch(() => undefined)
  return quote
}

/** A new draft revision from the latest one, repriced at today's rates; a sent one is superseded. */
export async function reviseQuote(workshopId: number, id: number, version: number): Promise<Quote> {
  return useDb().transaction(async (trx) => {
    const latest = await latestOf(trx, workshopId, id)
    if (latest.status === 'draft') conflict(`Revision ${latest.revision} is still a draft: edit it instead`)
    if (latest.status === 'accepted') conflict(`Revision ${latest.revision} was accepted; it cannot be revised`)
    await quotesRepo.touch(trx, workshopId, id, version, {})
    await quotesRepo.setStatus(trx, workshopId, latest.id, ['sent'], 'superseded')
    const figures = price(await ratesRepo.get(trx, workshopId), latest.take_off as TakeOffInput)
    await quotesRepo.insertRevision(trx, workshopId, id, latest.revision + 1, figures)
    return readQuote(trx, workshopId, id)
  })
}

// The client's side: people of the quote's client organisation read its sent revisions (never
// a draft, never the shop's estimate) and decide on the latest one.

async function clientQuoteRow(db: Knex, actor: Actor, id: number) {
  const org = await usersRepo.clientOrgOf(db, actor.workshopId, actor.id)
  const q = await quotesRepo.byId(db, actor.workshopId, id)
  // another organisation's quote, or one never sent, is not there for this client
  const shown = q && org !== null && q.client_org_id === org ? (await quotesRepo.revisions(db, actor.workshopId, id)).filter(r => r.status !== 'draft') : []
  if (!q || !shown.length) notFound('Quote')
  return { q, shown }
}

function toClientQuote(q: QuoteRow, revisions: QuoteVersionRow[]): ClientQuote {
  const latest = revisions.at(-1)!
  return {
    id: q.id, number: quoteNumber(q.number), title: q.title, revision: latest.revision, status: latest.status,
    currency: latest.currency,
    lines: (latest.lines as QuoteLine[]).map(({ estimate: _estimate, ...line }) => line),
    net: latest.net, tax: latest.tax, total: latest.total, deposit: latest.deposit,
    sentAt: isoOrNull(latest.sent_at), decidedAt: isoOrNull(latest.decided_at), decisionComment: latest.decision_comment,
    earlier: revisions.slice(0, -1).map(r => ({ revision: r.revision, status: r.status, total: r.total, sentAt: isoOrNull(r.sent_at) })),
  }
}

export async function clientQuotes(actor: Actor): Promise<ClientQuoteSummary[]> {
  const db = useDb()
  const org = await usersRepo.clientOrgOf(db, actor.workshopId, actor.id)
  if (org === null) return []
  return (await quotesRepo.sentToOrg(db, actor.workshopId, org)).map(r => ({
    id: r.id, number: quoteNumber(r.number), title: r.title, revision: r.revision, status: r.status, currency: r.currency, total: r.total,
  }))
}

export async function clientQuote(actor: Actor, id: number): Promise<ClientQuote> {
  const { q, shown } = await clientQuoteRow(useDb(), actor, id)
  return toClientQuote(q, shown)
}

/** The client accepts the revision they read, or asks for changes with a comment; the leads are told. */
export async function decideQuote(actor: Actor, id: number, input: { revision: number; decision: 'accept' | 'changes'; comment?: string | null }): Promise<ClientQuote> {
  const result = await useDb().transaction(async (trx) => {
    const { q, shown } = await clientQuoteRow(trx, actor, id)
    const latest = shown.at(-1)!
    if (latest.revision !== input.revision) conflict(`Revision ${input.revision} is no longer the latest; read revision ${latest.revision} first`)
    const status = input.decision === 'accept' ? 'accepted' : 'changes_requested'
    if (!(await quotesRepo.setStatus(trx, actor.workshopId, latest.id, ['sent'], status, { decided: true, comment: input.comment ?? null }))) {
      conflict(`Revision ${latest.revision} has already been decided`)
    }
    await recordEvent(trx, { workshopId: actor.workshopId, entity: 'quote', entityId: id, type: `quote.${status}`, actorId: actor.id, data: { revision: latest.revision, comment: input.comment ?? null } })
    await notifyQuoteDecision(trx, actor.workshopId, { id, number: quoteNumber(q.number), revision: latest.revision, clientName: actor.name, accepted: status === 'accepted', comment: input.comment ?? null })
    return toClientQuote(q, await quotesRepo.revisions(trx, actor.workshopId, id).then(all => all.filter(r => r.status !== 'draft')))
  })
  void deliverDueMail().catch(() => undefined)
  return result
}

// An accepted quote becomes a job in one step, in one transaction: the job for the quote's client
// at a site of theirs (picked or made here), one item per run and per ornament of the accepted
// revision's take-off (shared/utils/quote-job.ts: each with its share of the shop's estimate and
// of the client's price, from which a dispatch note's invoice lines are priced;
// fixing and delivery stay on the quote), the quote's deposit asked before the moulds start, the
// client organisation's people made members so they follow it and can pay the deposit, and the
// quote linked to its job. A quote not accepted, or already made into a job, is refused (409).
import type { Knex } from 'knex'
import type { Actor } from '../utils/auth'
import { quotesRepo } from '../repos/quotes'
import { jobsRepo } from '../repos/jobs'
import { jobItemsRepo } from '../repos/job-items'
import { clientSitesRepo } from '../repos/client-sites'
import { profilesRepo } from '../repos/profiles'
import { usersRepo } from '../repos/users'
import { recordEvent } from '../repos/events'
import { quoteNumber } from './quotes'
import { toJob } from './jobs'
import { quoteToJobItems } from '#shared/utils/quote-job'
import type { QuoteLine } from '#shared/utils/quote-pricing'
import type { TakeOffInput } from '#shared/utils/quote-schemas'
import type { QuoteJobResult } from '#shared/types/quotes'

export interface QuoteJobInput {
  jobCode: string
  title?: string | null
  dueOn?: string | null
  siteId?: number | null
  newSite?: { name: string; address: string; postcode?: string | null } | null
}

async function siteFor(trx: Knex, workshopId: number, orgId: number, input: QuoteJobInput): Promise<{ id: number; name: string }> {
  if (input.newSite) {
    const made = await clientSitesRepo.insert(trx, workshopId, orgId, { name: input.newSite.name, address: input.newSite.address, postcode: input.newSite.postcode ?? null })
    return { id: made.id, name: made.name }
  }
  const site = await clientSitesRepo.byId(trx, workshopId, input.siteId!)
  if (!site || site.client_org_id !== orgId) unprocessable([{ field: 'siteId', message: 'Site is not one of this client\'s sites' }])
  return { id: site.id, name: site.name }
}

export async function makeJobFromQuote(actor: Actor, quoteId: number, input: QuoteJobInput): Promise<QuoteJobResult> {
  const ws = actor.workshopId
  return useDb().transaction(async (trx) => {
    // the quote row is held to the end, so two clicks at once make one job
    const q = await quotesRepo.lockForJob(trx, ws, quoteId)
    if (!q) notFound('Quote')
    const number = quoteNumber(q.number)
    if (q.job_id) {
      const made = await jobsRepo.byId(trx, ws, q.job_id)
      conflict(`Quote ${number} has already been made into job ${made?.code ?? 'that was since deleted'}`)
    }
    const latest = await quotesRepo.latest(trx, ws, quoteId)
    if (!latest || latest.status !== 'accepted') conflict(`Quote ${number} has not been accepted by the client; only an accepted quote becomes a job`)
    if (!q.client_org_id) conflict(`Quote ${number} has no client`)
    const site = await siteFor(trx, ws, q.client_org_id, input)
    const job = await jobsRepo.insert(trx, ws, {
      code: input.jobCode, title: input.title || q.title, dueOn: input.dueOn ?? null, clientOrgId: q.client_org_id, siteId: site.id, site: site.name,
      notes: `From quote ${number}, revision ${latest.revision}`,
    })
    if (latest.deposit > 0) await jobsRepo.setDeposit(trx, ws, job.id, latest.deposit)
    const { items } = quoteToJobItems(latest.take_off as TakeOffInput, latest.lines as QuoteLine[])
    let order = 0
    for (const item of items) {
      await jobItemsRepo.insertFromQuote(trx, ws, job.id, {
        mould_id: null, profile: item.profile, description: item.description,
        // the item names its profile in words and is linked when the workshop has it (the planner matches by name too)
        profile_id: await profilesRepo.find(trx, ws, item.profile),
        quantity: item.quantity, run_m: item.walls ? item.walls.reduce((m, w) => m + w.lengthM, 0) : null,
        walls: item.walls ? JSON.stringify(item.walls) : null, min_piece_m: item.minPieceM, spares_pct: item.sparesPct,
        projection_m: item.projectionM, saw_cut_m: item.sawCutM, corner_block_leg_m: item.cornerBlockLegM,
        pieces_needed: item.pieces, grade_id: null, consistency: null, sort_order: order++,
      }, item.estimateMinor, item.priceMinor)
    }
    for (const person of await usersRepo.orgRecipients(trx, ws, q.client_org_id)) await jobsRepo.addMember(trx, ws, job.id, person.id)
    await quotesRepo.setJob(trx, ws, quoteId, job.id)
    await recordEvent(trx, { workshopId: ws, entity: 'quote', entityId: quoteId, type: 'quote.job_made', actorId: actor.id, data: { jobId: job.id, revision: latest.revision, items: items.length, depositMinor: latest.deposit } })
    return { quoteId, jobId: job.id, job: toJob(job), items: items.length, depositMinor: latest.deposit }
  })
}

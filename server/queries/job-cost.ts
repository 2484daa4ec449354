// The lead's "Cost against estimate" on a job page (GET /api/jobs/:id/cost): the register's
// weights and times read for the pure roll-up in shared/utils/job-cost.ts (its header has the
// rules). Every read is scoped to the workshop. What this file decides is only which rows count:
// - a pour's plaster: its weighed batch and its lot's bag mass and price per bag;
// - a pour's casting span: from its mixing start, booked to whoever the register says started the
//   mixing (the planned caster when the register has no actor), to the end of clean-out (the
//   mould's clean minutes after demoulding). A pour not demoulded runs to now, but no further
//   than the close of its demould window plus clean-out (a pour forgotten on the board stops
//   costing there); a void pour ends at its voiding. Every pour of the same casters over the
//   job's casting time is read, so time shared with other jobs is shared with them;
// - the finishing tablet's timer steps on the job's pieces;
// - the mould works of the moulds the job's items cast in, shared with every item of a job not
//   cancelled that names the same mould;
// - the estimate: each item's estimate_minor and the accepted quote's estimate.
import type { Knex } from 'knex'
import type { JobCostDto } from '#shared/types/job-cost'
import { jobCost, JOB_COST_FINISHING_TYPES, type JobCostCastingSpan, type JobCostFinishingType } from '#shared/utils/job-cost'
import type { MouldWorkStageRow } from '#shared/utils/mould-work'
import { ratesRepo } from '../repos/rates'

const num = (v: unknown) => (v === null || v === undefined ? null : Number(v))

/** The casting spans of the workshop's pours mixed by `people` from `from` on (SQL: one row per pour). */
const SPANS_SQL = `
  WITH spans AS (
    SELECT p.id, p.job_item_id, p.mixing_at AS start,
      coalesce(me.actor_id, p.caster_id) AS person,
      CASE
        WHEN p.demoulded_at IS NOT NULL THEN p.demoulded_at + make_interval(mins => m.clean_minutes)
        WHEN p.state = 'void' THEN coalesce(ve.at, p.updated_at)
        ELSE least(CAST(:now AS timestamptz), p.demould_close_at + make_interval(mins => m.clean_minutes))
      END AS "end"
    FROM pours p
    JOIN moulds m ON m.id = p.mould_id AND m.workshop_id = p.workshop_id
    LEFT JOIN LATERAL (SELECT e.actor_id FROM events e WHERE e.workshop_id = p.workshop_id AND e.entity = 'pour'
      AND e.entity_id = p.id::text AND e.type = 'pour.mixing' ORDER BY e.at DESC, e.id DESC LIMIT 1) me ON true
    LEFT JOIN LATERAL (SELECT e.at FROM events e WHERE e.workshop_id = p.workshop_id AND e.entity = 'pour'
      AND e.entity_id = p.id::text AND e.type = 'pour.voided' ORDER BY e.at DESC, e.id DESC LIMIT 1) ve ON true
    WHERE p.workshop_id = :workshopId AND p.mixing_at IS NOT NULL)`

export async function jobCostView(db: Knex, workshopId: number, jobId: number, now = new Date()): Promise<JobCostDto | null> {
  const job = await db('jobs').first('id', 'code').where({ workshop_id: workshopId, id: jobId })
  if (!job) return null
  const [rates, items] = await Promise.all([
    ratesRepo.get(db, workshopId),
    db('job_items').select('id', 'description', 'estimate_minor', 'mould_id')
      .where({ workshop_id: workshopId, job_id: jobId }).orderBy(['sort_order', 'id']),
  ])
  const itemIds = items.map(i => Number(i.id))

  const pours = await db('pours as p').leftJoin('plaster_lots as l', function () {
    this.on('l.id', 'p.lot_id').andOn('l.workshop_id', 'p.workshop_id')
  }).where('p.workshop_id', workshopId).whereIn('p.job_item_id', itemIds)
    .select('p.id', 'p.job_item_id', 'p.plaster_kg_actual', 'l.bag_kg', 'l.price_per_bag')

  // this job's spans first, then every other span of the same people over the same hours (other
  // jobs' pours and stock pours, which have no item)
  const own: { id: number; job_item_id: number | null; start: Date; end: Date; person: number | null }[] = itemIds.length
    ? (await db.raw(`${SPANS_SQL} SELECT * FROM spans WHERE job_item_id = ANY(:itemIds)`, { workshopId, itemIds, now: now.toISOString() })).rows
    : []
  const people = [...new Set(own.map(s => s.person).filter((p): p is number => p !== null).map(Number))]
  const from = new Date(Math.min(...own.map(s => new Date(s.start).getTime())))
  const until = new Date(Math.max(...own.map(s => new Date(s.end).getTime())))
  const others: typeof own = people.length
    ? (await db.raw(`${SPANS_SQL} SELECT * FROM spans WHERE person = ANY(:people) AND start < :until AND "end" > :from
        AND (job_item_id IS NULL OR NOT (job_item_id = ANY(:itemIds)))`,
      { workshopId, people, itemIds, now: now.toISOString(), from: from.toISOString(), until: until.toISOString() })).rows
    : []
  const ownIds = new Set(itemIds)
  const casting: JobCostCastingSpan[] = [...own, ...others]
    .filter(s => s.person !== null)
    .map(s => ({
      pourId: Number(s.id),
      itemId: s.job_item_id !== null && ownIds.has(Number(s.job_item_id)) ? Number(s.job_item_id) : null,
      personId: Number(s.person),
      start: new Date(s.start),
      end: new Date(s.end),
    }))

  const finishing = itemIds.length
    ? await db('events as e').join('pieces as c', function () {
        this.on(db.raw('c.id::text = e.entity_id')).andOn('c.workshop_id', 'e.workshop_id')
      }).where({ 'e.workshop_id': workshopId, 'e.entity': 'piece' })
        .whereIn('e.type', JOB_COST_FINISHING_TYPES.map(t => `piece.${t}`))
        .whereIn('c.job_item_id', itemIds).whereNotNull('e.actor_id')
        .select('c.id as piece_id', 'c.job_item_id', 'e.actor_id', 'e.type', 'e.at')
        .orderBy([{ column: 'e.at' }, { column: 'e.id' }])
    : []

  const mouldIds = [...new Set(items.map(i => i.mould_id).filter(m => m !== null).map(Number))]
  const works = mouldIds.length
    ? await db('mould_works').select('id', 'mould_id', 'assigned_to', 'stages').where({ workshop_id: workshopId }).whereIn('mould_id', mouldIds)
    : []
  const sharers: { mould_id: number; n: number }[] = mouldIds.length
    ? await db('job_items as i').join('jobs as j', function () {
        this.on('j.id', 'i.job_id').andOn('j.workshop_id', 'i.workshop_id')
      }).where('i.workshop_id', workshopId).whereIn('i.mould_id', mouldIds).whereNot('j.state', 'cancelled')
        .groupBy('i.mould_id').select('i.mould_id', db.raw('count(*)::int AS n'))
    : []
  const sharedBy = new Map(sharers.map(s => [Number(s.mould_id), Number(s.n)]))

  const quote = await db('quote_versions as v').join('quotes as q', function () {
    this.on('q.id', 'v.quote_id').andOn('q.workshop_id', 'v.workshop_id')
  }).first('q.number', 'v.revision', 'v.estimate')
    .where({ 'v.workshop_id': workshopId, 'q.job_id': jobId, 'v.status': 'accepted' })
    .orderBy([{ column: 'v.decided_at', order: 'desc' }, { column: 'v.id', order: 'desc' }])

  const r = jobCost({
    labourPerHourMinor: Number(rates.labour_per_hour),
    items: items.map(i => ({ id: Number(i.id), estimateMinor: num(i.estimate_minor) })),
    pours: pours.map(p => ({
      id: Number(p.id), itemId: Number(p.job_item_id), plasterKg: num(p.plaster_kg_actual), bagKg: num(p.bag_kg), pricePerBagMinor: num(p.price_per_bag),
    })),
    casting,
    finishing: finishing.map(e => ({
      pieceId: Number(e.piece_id), itemId: Number(e.job_item_id), personId: Number(e.actor_id),
      type: String(e.type).slice('piece.'.length) as JobCostFinishingType, at: new Date(e.at),
    })),
    mouldWorks: works.map(w => ({
      id: Number(w.id),
      personId: num(w.assigned_to),
      hours: (w.stages as MouldWorkStageRow[]).reduce((h, s) => h + (typeof s.hours === 'number' ? s.hours : 0), 0),
      itemIds: items.filter(i => Number(i.mould_id) === Number(w.mould_id)).map(i => Number(i.id)),
      sharedBy: sharedBy.get(Number(w.mould_id)) ?? 1,
    })),
    quoteEstimateMinor: quote ? Number(quote.estimate) : null,
    now,
  })

  const ids = r.people.map(p => p.personId)
  const names = new Map<number, string>(ids.length
    ? (await db('users').select('id', 'name').where({ workshop_id: workshopId }).whereIn('id', ids)).map(u => [Number(u.id), u.name])
    : [])
  const description = new Map(items.map(i => [Number(i.id), String(i.description)]))
  return {
    jobId: Number(job.id),
    jobCode: job.code,
    currency: rates.currency,
    labourPerHour: Number(rates.labour_per_hour),
    asOf: now.toISOString(),
    items: r.items.map(i => ({ ...i, description: description.get(i.itemId) ?? '' })),
    total: r.total,
    quote: quote ? { number: Number(quote.number), revision: Number(quote.revision) } : null,
    people: r.people.map(p => ({ ...p, name: names.get(p.personId) ?? 'someone no longer here' }))
      .sort((a, b) => a.name.localeCompare(b.name)),
    unpricedPours: r.unpricedPours,
    running: r.running,
  }
}

/**
 * A job's actual cost from its register, against the shop's own estimate. Pure.
 *
 * Plaster, per pour: the weighed batch (kg of plaster put in the bowl) ÷ the lot's bag mass ×
 * the lot's price per bag. The batch is what was bought and used, bowl and spill included, so
 * the waste is costed too (common practice in job costing: material issued, not material in the
 * product). A pour without a lot, or whose lot has no price, is counted as unpriced, not as free.
 *
 * Labour, at the workshop's one hourly rate, booked to the person the register says took the step:
 * - Casting: from the start of mixing to the end of clean-out. No clean-out step is recorded, so
 *   it ends the mould's clean minutes after demoulding (the same end the board gives the pour's
 *   slot); a pour still setting runs to `now`. A caster with several pours going at once is
 *   one person: each moment of their time is shared equally between the pours they had open then
 *   (every pour of theirs counts, other jobs' too), so their hours are never counted twice. This
 *   is the usual equal split of shared time in job costing (common practice); Setline's rule.
 * - Fettling and repair: from a start to the next stop on the finishing tablet, or to the step
 *   that ends the work (fettled or sent to repair; repaired; rejected ends either). A start while one is running
 *   for the same piece hands it over: the first is closed there. A timer still running counts
 *   to `now`. Booked to whoever started it.
 * - Mould-making: the hours written on each stage of the mould's work records, at the same rate,
 *   shared equally between the job items (of every job) that cast in that mould: a mould serves
 *   every job that uses it (the usual spreading of tooling cost; common practice).
 *
 * Money is exact (money.ts): time is kept in integer milliseconds, a shared moment as an exact
 * fraction over one common denominator, and each amount is rounded once, half away from zero,
 * per pour (plaster), per item and kind of labour, and per mould work's share. The total is the
 * sum of the items. The estimate is the item's `estimateMinor` (copied from the accepted quote's
 * line) and, in total, the accepted quote's estimate; without an accepted quote there is no
 * estimate and no difference.
 */
import { MoneyInputError, assertMinor, lineAmount, quantityMilli } from './money'

const HOUR_MS = 3_600_000n

export const JOB_COST_KINDS = ['plaster', 'casting', 'fettling', 'repair', 'mouldMaking'] as const
export type JobCostKind = (typeof JOB_COST_KINDS)[number]

/** The words a lead reads for each kind of cost. */
export const JOB_COST_KIND_WORDS: Record<JobCostKind, string> = {
  plaster: 'Plaster', casting: 'Casting', fettling: 'Fettling', repair: 'Repair', mouldMaking: 'Mould-making',
}

export interface JobCostPour {
  id: number
  itemId: number
  /** The weighed batch's plaster, kg; null until the pour's weights are in. */
  plasterKg: number | null
  bagKg: number | null
  pricePerBagMinor: number | null
}

/** One pour's casting time: mixing start to clean-out end (or `now`), and who mixed it. */
export interface JobCostCastingSpan {
  pourId: number
  /** This job's item, or null for another job's or a stock pour that shares the caster's time. */
  itemId: number | null
  personId: number
  start: Date
  end: Date
}

export const JOB_COST_FINISHING_TYPES = ['fettle_start', 'fettle_stop', 'fettled', 'repair', 'repair_start', 'repair_stop', 'repaired', 'rejected'] as const
export type JobCostFinishingType = (typeof JOB_COST_FINISHING_TYPES)[number]

export interface JobCostFinishingEvent {
  pieceId: number
  itemId: number
  personId: number
  type: JobCostFinishingType
  at: Date
}

export interface JobCostMouldWork {
  id: number
  personId: number | null
  /** Hours written on the work's stages. */
  hours: number
  /** This job's items that cast in the mould. */
  itemIds: number[]
  /** How many items, across every job, cast in the mould (this job's included): the share. */
  sharedBy: number
}

export interface JobCostInput {
  labourPerHourMinor: number
  items: { id: number; estimateMinor: number | null }[]
  pours: JobCostPour[]
  casting: JobCostCastingSpan[]
  finishing: JobCostFinishingEvent[]
  mouldWorks: JobCostMouldWork[]
  /** The accepted quote's estimate; null: the job has no accepted quote. */
  quoteEstimateMinor: number | null
  now: Date
}

export type JobCostAmounts = Record<JobCostKind, number> & { total: number }

export interface JobCostItem extends JobCostAmounts {
  itemId: number
  estimate: number | null
  /** Actual less estimate: positive is over the estimate. */
  difference: number | null
}

export interface JobCostPerson {
  personId: number
  castingMinutes: number
  fettlingMinutes: number
  repairMinutes: number
  mouldHours: number
}

export interface JobCostResult {
  items: JobCostItem[]
  total: JobCostAmounts & { estimate: number | null; difference: number | null }
  people: JobCostPerson[]
  /** Pours with a weighed batch but no lot price (their plaster is not in the cost). */
  unpricedPours: number
  /** Casting spans and finishing timers still running (counted to `now`). */
  running: number
}

/** n / d rounded half away from zero, in integers (n, d ≥ 0 here). */
function divRound(n: bigint, d: bigint): bigint {
  return (2n * n + d) / (2n * d)
}

const gcd = (a: bigint, b: bigint): bigint => (b === 0n ? a : gcd(b, a % b))
const lcm = (a: bigint, b: bigint) => (a / gcd(a, b)) * b

/** One pour's plaster: batch kg ÷ bag kg × price per bag, rounded once; null when unpriced. */
export function jobCostPourPlaster(p: Pick<JobCostPour, 'plasterKg' | 'bagKg' | 'pricePerBagMinor'>): number | null {
  if (p.plasterKg === null || p.bagKg === null || p.pricePerBagMinor === null) return null
  const kg = quantityMilli(p.plasterKg, 'plasterKg')
  const bag = quantityMilli(p.bagKg, 'bagKg')
  if (bag === 0n) throw new MoneyInputError('bagKg', 'bagKg must be more than 0 kg')
  return Number(divRound(kg * BigInt(assertMinor(p.pricePerBagMinor, 'pricePerBag')), bag))
}

/**
 * Each span's share of its person's time, as exact numerators over one denominator: at every
 * moment a person's time is split equally between the spans open then.
 */
export function jobCostCastingShares(spans: readonly JobCostCastingSpan[]): { denominator: bigint; shareMs: Map<number, bigint> } {
  const byPerson = new Map<number, JobCostCastingSpan[]>()
  for (const s of spans) {
    if (s.end.getTime() <= s.start.getTime()) continue
    byPerson.set(s.personId, [...(byPerson.get(s.personId) ?? []), s])
  }
  const segments: { length: bigint; open: JobCostCastingSpan[] }[] = []
  let denominator = 1n
  for (const own of byPerson.values()) {
    const points = [...new Set(own.flatMap(s => [s.start.getTime(), s.end.getTime()]))].sort((a, b) => a - b)
    for (let k = 0; k + 1 < points.length; k++) {
      const from = points[k]!
      const to = points[k + 1]!
      const open = own.filter(s => s.start.getTime() <= from && s.end.getTime() >= to)
      if (open.length === 0) continue
      segments.push({ length: BigInt(to - from), open })
      denominator = lcm(denominator, BigInt(open.length))
    }
  }
  const shareMs = new Map<number, bigint>()
  for (const seg of segments) {
    const each = seg.length * (denominator / BigInt(seg.open.length))
    for (const s of seg.open) shareMs.set(s.pourId, (shareMs.get(s.pourId) ?? 0n) + each)
  }
  return { denominator, shareMs }
}

interface Timed { itemId: number; personId: number; kind: 'fettling' | 'repair'; ms: bigint; running: boolean }

const ENDS: Record<'fettling' | 'repair', readonly JobCostFinishingType[]> = {
  fettling: ['fettle_stop', 'fettled', 'repair', 'rejected'],
  repair: ['repair_stop', 'repaired', 'rejected'],
}
const STARTS: Record<'fettling' | 'repair', JobCostFinishingType> = { fettling: 'fettle_start', repair: 'repair_start' }

/** Fettling and repair time: start to the next stop or ending step, per piece and kind. */
export function jobCostFinishingTimes(events: readonly JobCostFinishingEvent[], now: Date): Timed[] {
  const out: Timed[] = []
  const byPiece = new Map<number, JobCostFinishingEvent[]>()
  for (const e of events) byPiece.set(e.pieceId, [...(byPiece.get(e.pieceId) ?? []), e])
  for (const list of byPiece.values()) {
    const sorted = [...list].sort((a, b) => a.at.getTime() - b.at.getTime())
    for (const kind of ['fettling', 'repair'] as const) {
      let open: JobCostFinishingEvent | null = null
      const close = (at: Date, running: boolean) => {
        if (!open) return
        const ms = Math.max(0, at.getTime() - open.at.getTime())
        out.push({ itemId: open.itemId, personId: open.personId, kind, ms: BigInt(ms), running })
        open = null
      }
      for (const e of sorted) {
        if (e.type === STARTS[kind]) {
          close(e.at, false)
          open = e
        }
        else if (ENDS[kind].includes(e.type)) close(e.at, false)
      }
      close(now, true)
    }
  }
  return out
}

const zero = (): JobCostAmounts => ({ plaster: 0, casting: 0, fettling: 0, repair: 0, mouldMaking: 0, total: 0 })

/** The job's cost per item and in total, and the hours per person, from the register. */
export function jobCost(input: JobCostInput): JobCostResult {
  const rate = BigInt(assertMinor(input.labourPerHourMinor, 'labourPerHour'))
  const items = new Map(input.items.map(i => [i.id, zero()]))
  const people = new Map<number, { castingMs: number; fettlingMs: number; repairMs: number; mouldHours: number }>()
  const person = (id: number) => {
    if (!people.has(id)) people.set(id, { castingMs: 0, fettlingMs: 0, repairMs: 0, mouldHours: 0 })
    return people.get(id)!
  }

  let unpricedPours = 0
  for (const p of input.pours) {
    const amount = jobCostPourPlaster(p)
    const row = items.get(p.itemId)
    if (!row) continue
    if (amount === null) {
      if (p.plasterKg !== null) unpricedPours++
      continue
    }
    row.plaster += amount
  }

  // labour time per item and kind as numerators over one denominator, priced once per item and kind
  const { denominator, shareMs } = jobCostCastingShares(input.casting)
  const labour = new Map<number, { casting: bigint; fettling: bigint; repair: bigint }>()
  const labourOf = (itemId: number) => {
    if (!labour.has(itemId)) labour.set(itemId, { casting: 0n, fettling: 0n, repair: 0n })
    return labour.get(itemId)!
  }
  let running = 0
  for (const s of input.casting) {
    if (s.itemId === null || !items.has(s.itemId)) continue
    const share = shareMs.get(s.pourId) ?? 0n
    labourOf(s.itemId).casting += share
    person(s.personId).castingMs += Number(share) / Number(denominator)
    if (s.end.getTime() >= input.now.getTime()) running++
  }
  for (const t of jobCostFinishingTimes(input.finishing, input.now)) {
    if (!items.has(t.itemId)) continue
    labourOf(t.itemId)[t.kind] += t.ms * denominator
    person(t.personId)[t.kind === 'fettling' ? 'fettlingMs' : 'repairMs'] += Number(t.ms)
    if (t.running) running++
  }
  for (const [itemId, l] of labour) {
    const row = items.get(itemId)!
    for (const kind of ['casting', 'fettling', 'repair'] as const) {
      row[kind] = Number(divRound(l[kind] * rate, denominator * HOUR_MS))
    }
  }

  for (const w of input.mouldWorks) {
    const own = w.itemIds.filter(id => items.has(id))
    if (own.length === 0 || w.sharedBy < 1) continue
    const whole = BigInt(lineAmount(w.hours, Number(rate), 'hours'))
    const each = Number(divRound(whole, BigInt(w.sharedBy)))
    for (const id of own) items.get(id)!.mouldMaking += each
    if (w.personId !== null) person(w.personId).mouldHours += (w.hours * own.length) / w.sharedBy
  }

  const total = zero()
  const outItems: JobCostItem[] = input.items.map((i) => {
    const row = items.get(i.id)!
    row.total = JOB_COST_KINDS.reduce((n, k) => n + row[k], 0)
    for (const k of [...JOB_COST_KINDS, 'total'] as const) total[k] += row[k]
    const estimate = i.estimateMinor
    return { itemId: i.id, ...row, estimate, difference: estimate === null ? null : row.total - estimate }
  })
  const estimate = input.quoteEstimateMinor
  return {
    items: outItems,
    total: { ...total, estimate, difference: estimate === null ? null : total.total - estimate },
    people: [...people].map(([personId, p]) => ({
      personId,
      castingMinutes: p.castingMs / 60_000,
      fettlingMinutes: p.fettlingMs / 60_000,
      repairMinutes: p.repairMs / 60_000,
      mouldHours: p.mouldHours,
    })),
    unpricedPours,
    running,
  }
}

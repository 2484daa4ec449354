/**
 * Take-off and priced quote lines for a job, before a mould is made. Pure.
 *
 * Take-off: per room, each run of cornice is cut with the run calculator (`runCutList`, its
 * corners, returns, saw cut and offcut reuse), and each ornament (ceiling centre, corbel,
 * patera) is counted. Plaster is the per-length or per-piece batch the shop enters for the
 * profile, summed over the job and bought in whole bags once for the job (`bagsForKg`).
 *
 * Pricing: the workshop's rates are its costs (minor units, see money.ts); the margin is added
 * to each unit rate once, so the lines the client reads already carry it and add up to the
 * total without a hidden line. Tax is charged on the sum of the lines. Every amount is rounded
 * once to the minor unit (money.ts). The cost of each line at the shop's own rates is kept as
 * the job's estimate, for the cost-against-estimate view later.
 * Which operations are priced, and how (casting per length or piece, fettling per piece, fixing
 * per metre of run, one mould per new profile, delivery per trip): common practice.
 */
import { bagsForKg, runCutList, type PlasterRunInput } from './plaster-cutlist'
import { MoneyInputError, assertMinor, lineAmount, shareOf } from './money'

export interface TakeOffRun extends PlasterRunInput {
  profile: string
  /** plaster for one cast length of this profile, kg (the shop's figure for its mould) */
  plasterKgPerLength: number
  /** true when the shop has no mould for this profile yet */
  newMould: boolean
}

export interface TakeOffOrnament {
  name: string
  count: number
  plasterKgEach: number
  newMould: boolean
}

export interface TakeOffRoom {
  name: string
  runs: TakeOffRun[]
  ornaments: TakeOffOrnament[]
}

export interface TakeOffRunResult {
  room: string
  profile: string
  lengths: number
  runM: number
  plasterKg: number
  newMould: boolean
}

export interface TakeOffResult {
  runs: TakeOffRunResult[]
  ornaments: (TakeOffOrnament & { room: string; plasterKg: number })[]
  /** profiles and ornaments that need a new mould, each once */
  newMoulds: string[]
  castLengths: number
  castPieces: number
  runM: number
  plasterKg: number
  bags: number
}

export function takeOff(rooms: TakeOffRoom[], bagKg: number): TakeOffResult {
  const runs: TakeOffRunResult[] = []
  const ornaments: TakeOffResult['ornaments'] = []
  const newMoulds = new Set<string>()
  rooms.forEach((room, r) => {
    room.runs.forEach((run, n) => {
      const field = `rooms[${r}].runs[${n}]`
      if (!(run.plasterKgPerLength > 0)) throw new MoneyInputError(`${field}.plasterKgPerLength`, `${field}.plasterKgPerLength must be more than 0 kg`)
      const cut = runCutList(run)
      runs.push({
        room: room.name,
        profile: run.profile,
        lengths: cut.lengths,
        runM: cut.runM.reduce((a, b) => a + b, 0),
        plasterKg: cut.lengths * run.plasterKgPerLength,
        newMould: run.newMould,
      })
      if (run.newMould) newMoulds.add(run.profile)
    })
    room.ornaments.forEach((o, n) => {
      const field = `rooms[${r}].ornaments[${n}]`
      if (!Number.isInteger(o.count) || o.count < 1) throw new MoneyInputError(`${field}.count`, `${field}.count must be a whole number of 1 or more`)
      if (!(o.plasterKgEach > 0)) throw new MoneyInputError(`${field}.plasterKgEach`, `${field}.plasterKgEach must be more than 0 kg`)
      ornaments.push({ ...o, room: room.name, plasterKg: o.count * o.plasterKgEach })
      if (o.newMould) newMoulds.add(o.name)
    })
  })
  const plasterKg = runs.reduce((a, x) => a + x.plasterKg, 0) + ornaments.reduce((a, x) => a + x.plasterKg, 0)
  return {
    runs,
    ornaments,
    newMoulds: [...newMoulds],
    castLengths: runs.reduce((a, x) => a + x.lengths, 0),
    castPieces: ornaments.reduce((a, x) => a + x.count, 0),
    // to the millimetre: fixing is priced per metre and quantities are exact to a thousandth
    runM: Math.round(runs.reduce((a, x) => a + x.runM, 0) * 1000) / 1000,
    plasterKg,
    bags: bagsForKg(plasterKg, bagKg),
  }
}

/** The workshop's rates, each in minor units per unit, and its margin and tax in basis points. */
export interface WorkshopRates {
  plasterPerBag: number
  mouldPerProfile: number
  castPerLength: number
  castPerPiece: number
  fettlePerPiece: number
  fixPerMetre: number
  deliveryPerTrip: number
  marginBp: number
  taxBp: number
}

export type QuoteLineKind = 'mould' | 'cast-length' | 'cast-piece' | 'fettle' | 'plaster' | 'fixing' | 'delivery'

export interface QuoteLine {
  kind: QuoteLineKind
  description: string
  quantity: number
  unit: string
  /** the client's unit price, margin included */
  unitPrice: number
  amount: number
  /** what the line costs the shop at its own rates: the estimate */
  estimate: number
}

export interface PricedQuote {
  lines: QuoteLine[]
  net: number
  tax: number
  total: number
  estimate: number
}

export interface QuoteOptions {
  deliveries: number
  /** false when the client fixes the work themselves */
  fixing: boolean
}

const RATE_FIELDS: (keyof WorkshopRates)[] = ['plasterPerBag', 'mouldPerProfile', 'castPerLength', 'castPerPiece', 'fettlePerPiece', 'fixPerMetre', 'deliveryPerTrip']

export function priceQuote(t: TakeOffResult, rates: WorkshopRates, options: QuoteOptions): PricedQuote {
  for (const f of RATE_FIELDS) assertMinor(rates[f], f)
  if (!Number.isInteger(options.deliveries) || options.deliveries < 0) {
    throw new MoneyInputError('deliveries', 'deliveries must be a whole number of 0 or more')
  }
  const sell = (rate: number) => rate + shareOf(rate, rates.marginBp, 'margin')
  const line = (kind: QuoteLineKind, description: string, quantity: number, unit: string, rate: number): QuoteLine => ({
    kind,
    description,
    quantity,
    unit,
    unitPrice: sell(rate),
    amount: lineAmount(quantity, sell(rate)),
    estimate: lineAmount(quantity, rate),
  })
  const lines: QuoteLine[] = [
    ...t.newMoulds.map(name => line('mould', `New mould: ${name}`, 1, 'mould', rates.mouldPerProfile)),
    ...t.runs.map(r => line('cast-length', `${r.profile}, ${r.room}`, r.lengths, 'length', rates.castPerLength)),
    ...t.ornaments.map(o => line('cast-piece', `${o.name}, ${o.room}`, o.count, 'piece', rates.castPerPiece)),
  ]
  const pieces = t.castLengths + t.castPieces
  if (pieces > 0) lines.push(line('fettle', 'Fettling and finishing', pieces, 'piece', rates.fettlePerPiece))
  if (t.bags > 0) lines.push(line('plaster', 'Casting plaster', t.bags, 'bag', rates.plasterPerBag))
  if (options.fixing && t.runM > 0) lines.push(line('fixing', 'Fixing run work on site', t.runM, 'm', rates.fixPerMetre))
  if (options.deliveries > 0) lines.push(line('delivery', 'Delivery to site', options.deliveries, 'trip', rates.deliveryPerTrip))
  const net = lines.reduce((a, l) => a + l.amount, 0)
  const tax = shareOf(net, rates.taxBp, 'tax')
  return { lines, net, tax, total: net + tax, estimate: lines.reduce((a, l) => a + l.estimate, 0) }
}

/** The deposit asked before moulds start: a share of the total, rounded once. */
export function depositFor(total: number, depositBp: number): number {
  return shareOf(total, depositBp, 'deposit')
}

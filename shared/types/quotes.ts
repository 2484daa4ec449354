// What the rates and quote routes send (camelCase on the wire). Amounts are integers of the
// workshop currency's minor unit (shared/utils/money.ts); percentages are numbers (12.5 = 12.5 %).
import type { QuoteLine } from '../utils/quote-pricing'
import type { TakeOffInput } from '../utils/quote-schemas'
import type { Job } from './jobs'

/** The workshop's rates as GET and PUT /api/rates answer. */
export interface Rates {
  currency: string
  plasterPerBag: number
  mouldPerProfile: number
  castPerLength: number
  castPerPiece: number
  fettlePerPiece: number
  fixPerMetre: number
  deliveryPerTrip: number
  marginPct: number
  taxPct: number
  depositPct: number
  /** the hourly labour rate the job's actual cost is priced at */
  labourPerHour: number
  version: number
}

export const QUOTE_STATUSES = ['draft', 'sent', 'accepted', 'changes_requested', 'superseded'] as const
export type QuoteStatus = (typeof QUOTE_STATUSES)[number]

/** One version of a quote: frozen once sent. `estimate` is the shop's own cost, never a client's. */
export interface QuoteRevision {
  revision: number
  status: QuoteStatus
  takeOff: TakeOffInput
  lines: QuoteLine[]
  currency: string
  net: number
  tax: number
  total: number
  estimate: number
  deposit: number
  sentAt: string | null
  decidedAt: string | null
  decisionComment: string | null
  createdAt: string
}

/** A quote as the lead reads it: its number (Q-0007), client and every revision, newest last. */
export interface Quote {
  id: number
  number: string
  title: string
  clientOrgId: number | null
  clientName: string | null
  jobId: number | null
  version: number
  revisions: QuoteRevision[]
}

/** A line of GET /api/quotes: the latest revision's status and total. */
export interface QuoteSummary {
  id: number
  number: string
  title: string
  clientName: string | null
  revision: number
  status: QuoteStatus
  currency: string
  total: number
  updatedAt: string
}

/** A quote as its client reads it: the latest sent revision's lines (no shop estimate), and the earlier ones in brief. */
export interface ClientQuote {
  id: number
  number: string
  title: string
  revision: number
  status: QuoteStatus
  currency: string
  lines: Omit<QuoteLine, 'estimate'>[]
  net: number
  tax: number
  total: number
  deposit: number
  sentAt: string | null
  decidedAt: string | null
  decisionComment: string | null
  earlier: { revision: number; status: QuoteStatus; total: number; sentAt: string | null }[]
}

/** A line of GET /api/client/quotes: the latest sent revision in brief. */
export type ClientQuoteSummary = Pick<ClientQuote, 'id' | 'number' | 'title' | 'revision' | 'status' | 'currency' | 'total'>

/** POST /api/quotes/[id]/job: the job made from the accepted quote, its item count and the deposit it asks. */
export interface QuoteJobResult {
  quoteId: number
  jobId: number
  job: Job
  items: number
  depositMinor: number
}

// What GET /api/jobs/:id/cost sends a lead (camelCase on the wire): the job's actual cost from its
// register against the shop's own estimate. Amounts in the workshop currency's minor unit
// (shared/utils/money.ts). Never a client's: no client route or socket carries any of it.
import type { JobCostAmounts, JobCostItem, JobCostPerson } from '../utils/job-cost'

export interface JobCostDto {
  jobId: number
  jobCode: string
  currency: string
  /** the hourly labour rate the time is priced at (the workshop's rates) */
  labourPerHour: number
  /** when it was worked out: running timers and pours count to here */
  asOf: string
  items: (JobCostItem & { description: string })[]
  /** estimate: the accepted quote's; null when the job has no accepted quote ("no estimate") */
  total: JobCostAmounts & { estimate: number | null; difference: number | null }
  /** the accepted quote it is compared with, or null */
  quote: { number: number; revision: number } | null
  people: (JobCostPerson & { name: string })[]
  unpricedPours: number
  running: number
}

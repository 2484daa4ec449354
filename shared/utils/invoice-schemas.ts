// Shared zod schemas for invoices: lines typed by the lead (unit prices in minor units), for a
// stage of the job or a dispatch note of it; a void needs its reason.
import { z } from 'zod'
import { numberIn, optionalText, requiredText } from './catalogue-schemas'
import { MAX_MINOR } from './money'

export const invoiceLineSchema = z.object({
  description: requiredText('description', 200),
  quantity: numberIn('quantity', 0, 1_000_000, '', { exclusive: true }),
  unitPrice: z.number({ error: 'unitPrice must be an amount' }).int('unitPrice must be a whole number of pence or cents')
    .min(0, 'unitPrice must not be negative').max(MAX_MINOR, 'unitPrice is too large'),
})

export const invoiceCreateSchema = z.object({
  dispatchId: z.number({ error: 'dispatchId must be a dispatch note' }).int().positive().max(Number.MAX_SAFE_INTEGER).nullable().optional(),
  stage: optionalText('stage', 120),
  lines: z.array(invoiceLineSchema, { error: 'lines must be a list' }).min(1, 'lines must list at least one line').max(100, 'lines must list at most 100 lines'),
}).refine(v => !!v.dispatchId !== !!v.stage, { path: ['stage'], message: 'Name the stage, or choose the dispatch note the invoice is for (one of the two)' })

export const invoiceVoidSchema = z.object({ reason: requiredText('reason', 500) })

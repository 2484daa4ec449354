// What the invoice routes send. Amounts in the workshop currency's minor unit (money.ts).
import type { DraftInvoiceLine } from '../utils/invoice-lines'

export interface InvoiceLine {
  description: string
  quantity: number
  unitPrice: number
  amount: number
}

/** GET /api/dispatches/:id/invoice-lines: a dispatch note's pieces as the lines of its invoice, for the lead to read and edit. */
export interface DispatchInvoiceLines {
  dispatchId: number
  noteNo: string
  jobId: number
  currency: string
  lines: DraftInvoiceLine[]
}

/** An issued (or voided) invoice: never edited once issued. */
export interface Invoice {
  id: number
  number: string
  jobId: number
  jobCode: string
  dispatchId: number | null
  dispatchNote: string | null
  stage: string | null
  status: 'issued' | 'void'
  lines: InvoiceLine[]
  currency: string
  net: number
  tax: number
  total: number
  depositCredit: number
  amountDue: number
  voidReason: string | null
  issuedAt: string
  voidedAt: string | null
}

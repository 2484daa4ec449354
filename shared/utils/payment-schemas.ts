// Shared zod schemas for deposits and payments. Amounts are whole minor units (pence, cents).
import { z } from 'zod'
import { dayField, optionalText } from './catalogue-schemas'
import { MAX_MINOR } from './money'

export const PAYMENT_METHODS = ['bank_transfer', 'cash', 'cheque', 'other'] as const
export const PAYMENT_METHOD_LABELS: Record<(typeof PAYMENT_METHODS)[number] | 'card', string> = {
  card: 'Card (online)', bank_transfer: 'Bank transfer', cash: 'Cash', cheque: 'Cheque', other: 'Other',
}

const minor = (field: string, min: number) => z.number({ error: `${field} must be an amount` })
  .int(`${field} must be a whole number of pence or cents`).min(min, min > 0 ? `${field} must be more than 0` : `${field} must not be negative`).max(MAX_MINOR, `${field} is too large`)

export const depositSchema = z.object({ depositMinor: minor('depositMinor', 0) })

/** A payment a lead took another way (a card payment arrives through the payment service). */
export const manualPaymentSchema = z.object({
  amount: minor('amount', 1),
  method: z.enum(PAYMENT_METHODS, { error: 'method must be bank transfer, cash, cheque or other' }),
  paidOn: dayField('paidOn'),
  note: optionalText('note', 500),
})

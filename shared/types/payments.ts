// What the payment routes send. Amounts in the workshop currency's minor unit (money.ts).
export type PaymentMethod = 'card' | 'bank_transfer' | 'cash' | 'cheque' | 'other'
export type PaymentStatus = 'pending' | 'paid' | 'refunded' | 'cancelled'

export interface Payment {
  id: number
  purpose: 'deposit' | 'invoice'
  amount: number
  currency: string
  method: PaymentMethod
  status: PaymentStatus
  note: string | null
  paidAt: string | null
  refundedAt: string | null
  createdAt: string
}

/** A job's deposit: asked, paid (refunds taken off) and still to pay; `released` when nothing is outstanding. */
export interface DepositState {
  currency: string
  depositMinor: number
  paidMinor: number
  outstandingMinor: number
  released: boolean
}

export interface JobPayments extends DepositState {
  payments: Payment[]
}

/** The client's view of their job's deposit, and whether they can pay it by card here. */
export interface ClientDeposit extends DepositState {
  cardPayments: boolean
}

import { handlePaymentWebhook } from '../../services/payments'
// The payment service's webhook: no session, the signature over the raw body is the check.
export default defineEventHandler(async (event) => {
  const raw = (await readRawBody(event, 'utf8')) ?? ''
  return handlePaymentWebhook(raw, getHeader(event, 'stripe-signature'))
})

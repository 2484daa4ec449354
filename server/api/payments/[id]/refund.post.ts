import { refundPayment } from '../../../services/payments'
// Refund a paid payment (lead); a card payment is refunded through the payment service.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  return refundPayment(actor, id)
})

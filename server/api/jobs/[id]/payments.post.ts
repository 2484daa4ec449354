import { recordPayment } from '../../../services/payments'
// Record a payment taken another way than the card checkout (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, manualPaymentSchema)
  const result = await recordPayment(actor, id, input)
  setResponseStatus(event, 201)
  return result
})

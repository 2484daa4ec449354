import { proveDelivery } from '../../../services/deliveries'
// The proof of delivery (receiver, signature, photo, breakages), exactly once per actionId.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead', 'finisher')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, deliveryProofSchema)
  const answer = await proveDelivery(actor, id, input)
  if (answer.replayed) setResponseHeader(event, 'x-setline-replayed', '1')
  return answer.result
})

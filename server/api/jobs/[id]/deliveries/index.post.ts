import { bookDelivery } from '../../../../services/deliveries'
// A delivery booked against the job (lead): refused with the marks of any piece not packed.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, deliveryBookSchema)
  setResponseStatus(event, 201)
  return bookDelivery(actor, id, input)
})

import { clientDeliveries } from '../../../../services/deliveries'
// A client member's job's deliveries: day, state, counts, who signed; anyone else's job is a 404.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'client')
  const { id } = validParams(event, idParamSchema)
  return clientDeliveries(actor, id)
})

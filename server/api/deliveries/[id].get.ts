import { deliveryView } from '../../services/deliveries'
// One delivery, as the proof-of-delivery page shows it on site.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead', 'finisher')
  const { id } = validParams(event, idParamSchema)
  return deliveryView(actor, id)
})

import { jobDeliveries } from '../../../../services/deliveries'
// The job's deliveries, newest day first, with their pieces and what arrived broken.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead', 'finisher')
  const { id } = validParams(event, idParamSchema)
  return jobDeliveries(actor, id)
})

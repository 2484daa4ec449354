import { jobPayments } from '../../../services/payments'
// A job's deposit and payments (lead): money is the office's business.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  return jobPayments(actor.workshopId, id)
})

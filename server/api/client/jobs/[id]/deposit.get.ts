import { clientDeposit } from '../../../../services/payments'
// The deposit of a job the client is a member of, and whether it can be paid by card here.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'client')
  const { id } = validParams(event, idParamSchema)
  return clientDeposit(actor, id)
})

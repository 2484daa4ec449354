import { setDeposit } from '../../../services/payments'
// Set the deposit a job asks before its moulds start (lead); 0 asks none.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { depositMinor } = await validBody(event, depositSchema)
  return setDeposit(actor, id, depositMinor)
})

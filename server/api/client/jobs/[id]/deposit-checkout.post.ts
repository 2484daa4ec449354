import { startDepositCheckout } from '../../../../services/payments'
// Start paying the job's deposit on the payment service's own page; answers its address.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'client')
  const { id } = validParams(event, idParamSchema)
  return startDepositCheckout(actor, id)
})

import { getInvoice } from '../../services/invoices'
// One invoice (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  return getInvoice(actor.workshopId, id)
})

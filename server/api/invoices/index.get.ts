import { listInvoices } from '../../services/invoices'
// The workshop's invoices, newest first (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  return listInvoices(actor.workshopId)
})

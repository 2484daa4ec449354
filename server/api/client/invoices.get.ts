import { clientInvoices } from '../../services/invoices'
// The invoices of the client's own jobs (client).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'client')
  return clientInvoices(actor)
})

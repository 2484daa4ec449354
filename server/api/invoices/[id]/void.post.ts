import { voidInvoice } from '../../../services/invoices'
// Void an issued invoice with its reason: an invoice is never edited (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { reason } = await validBody(event, invoiceVoidSchema)
  return voidInvoice(actor, id, reason)
})

import { issueInvoice } from '../../../services/invoices'
// Issue an invoice for a stage or a dispatch note of the job, numbered INV-0001… (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, invoiceCreateSchema)
  const invoice = await issueInvoice(actor, id, input)
  setResponseStatus(event, 201)
  return invoice
})

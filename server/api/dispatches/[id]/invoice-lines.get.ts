import { dispatchInvoiceLines } from '../../../services/invoices'
// A dispatch note's pieces as invoice lines, priced from their items (lead): what the job page's
// invoice panel fills in when the note is picked; the lead edits them before issuing.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  return dispatchInvoiceLines(actor.workshopId, id)
})

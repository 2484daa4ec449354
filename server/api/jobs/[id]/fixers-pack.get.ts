import { fixersPackPdf } from '../../../services/fixers-pack'
// The fixer's pack for a job as a PDF (services/fixers-pack.ts): what goes where, weights, cautions.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead', 'finisher')
  const { id } = validParams(event, idParamSchema)
  const { filename, pdf } = await fixersPackPdf(actor, id)
  setResponseHeaders(event, { 'content-type': 'application/pdf', 'content-disposition': `inline; filename="${filename}"`, 'cache-control': 'private, no-store' })
  return pdf
})

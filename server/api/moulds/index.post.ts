import { saveMould } from '../../services/catalogue'
// A new mould (lead). A duplicate code is a 409.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const input = await validBody(event, mouldCreateSchema)
  const mould = await saveMould(actor, null, input)
  setResponseStatus(event, 201)
  return mould
})

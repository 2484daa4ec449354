import { createPour } from '../../services/pours'
// Plans a pour where the lead dropped it (lead). 409 names what stands in the way; the
// warnings it is saved with come back in the PourDto.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const input = await validBody(event, pourCreateSchema)
  setResponseStatus(event, 201)
  return createPour(actor, input)
})

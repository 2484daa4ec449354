import { createClient } from '../../services/clients'
// A new client organisation (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const input = await validBody(event, clientOrgCreateSchema)
  const org = await createClient(actor, input)
  setResponseStatus(event, 201)
  return org
})

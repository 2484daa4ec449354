import { addSite } from '../../../services/clients'
// A new site of a client organisation: address and access notes for deliveries (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, siteCreateSchema)
  const site = await addSite(actor, id, input)
  setResponseStatus(event, 201)
  return site
})

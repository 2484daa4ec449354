import { updateSite } from '../../services/clients'
// Edit a site's address or access notes (lead); the body names the version it saw.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { version, ...input } = await validBody(event, sitePatchSchema)
  return updateSite(actor, id, version, input)
})

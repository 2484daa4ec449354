import { updateClient } from '../../services/clients'
// Rename a client organisation or edit its notes (lead); the body names the version it saw.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { version, ...input } = await validBody(event, clientOrgPatchSchema)
  return updateClient(actor, id, version, input)
})

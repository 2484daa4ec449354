import { updateContact } from '../../services/clients'
// Edit a contact or the job mails they receive (lead); the body names the version it saw.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { version, ...input } = await validBody(event, contactPatchSchema)
  return updateContact(actor, id, version, input)
})

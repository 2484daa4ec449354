import { removeContact } from '../../services/clients'
// Remove a contact (lead): they get no more job mail. A portal member keeps their sign-in.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  await removeContact(actor, id)
  setResponseStatus(event, 204)
  return null
})

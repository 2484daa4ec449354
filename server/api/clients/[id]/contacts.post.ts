import { addContact } from '../../../services/clients'
// A new contact of a client organisation, with the job mails they receive (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, contactCreateSchema)
  const contact = await addContact(actor, id, input)
  setResponseStatus(event, 201)
  return contact
})

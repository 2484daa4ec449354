import { createProfile } from '../../services/catalogue'
// A new profile (lead); a name the workshop already has, in any case, answers that profile.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { name } = await validBody(event, profileCreateSchema)
  setResponseStatus(event, 201)
  return createProfile(actor, name)
})

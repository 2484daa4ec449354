import { changePerson } from '../../services/people'
// Disable / re-enable a user or change their role (lead). Either ends their sessions.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, userPatchSchema)
  return changePerson(actor, id, input)
})

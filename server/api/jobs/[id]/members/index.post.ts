import { addClientMember } from '../../../../services/jobs'
// Put a client on the job by e-mail (lead): an existing client is added, a new one invited.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, jobMemberInviteSchema)
  const result = await addClientMember(actor, id, input)
  setResponseStatus(event, result.status === 'invited' ? 201 : 200)
  return result
})

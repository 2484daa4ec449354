// Clears someone's tablet PIN (lead), e.g. when it got around: they set a new one on /account.
import { usersRepo } from '../../../repos/users'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  if (!(await usersRepo.setPin(useDb(), actor.workshopId, id, null))) notFound('User')
  return { id, hasPin: false }
})

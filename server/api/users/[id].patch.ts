import { usersRepo } from '../../repos/users'
import { setUserDisabled } from '../../services/accounts'
// Disable / re-enable a user or change their role (lead). Either ends their sessions.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, userPatchSchema)
  if (id === actor.id) unprocessable([{ field: 'id', message: 'you cannot disable yourself or change your own role' }])
  const db = useDb()
  const user = await usersRepo.byId(db, actor.workshopId, id)
  if (!user) notFound('User')
  let row = user
  if (input.role !== undefined) row = await usersRepo.setRole(db, actor.workshopId, id, input.role)
  if (input.disabled !== undefined) row = await setUserDisabled(actor.workshopId, id, input.disabled)
  // the schema asks for one of the two: either change ends their sessions and live sockets now
  await endUserSessions(actor.workshopId, id)
  return row
})

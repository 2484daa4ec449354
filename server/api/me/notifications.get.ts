// The signed-in user's e-mail notification settings: one flag per kind, on unless turned off.
import { usersRepo } from '../../repos/users'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...EVERYONE)
  return notifyPrefsOf(await usersRepo.notifyPrefs(useDb(), actor.workshopId, actor.id))
})

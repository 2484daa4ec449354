// Turns kinds of e-mail notification on or off for the signed-in user: { kind: boolean, … }.
// Only the named kinds change; the answer is every kind's flag.
import { usersRepo } from '../../repos/users'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...EVERYONE)
  const body = await validBody(event, notifyPrefsPatchSchema)
  const flags = Object.fromEntries(Object.entries(body).filter(([, v]) => v !== undefined)) as Record<string, boolean>
  return notifyPrefsOf(await usersRepo.mergeNotifyPrefs(useDb(), actor.workshopId, actor.id, flags))
})

// Removes my tablet PIN (caster, finisher): I no longer appear on the shared tablets.
import type { PinStateDto } from '#shared/types/tablets'
import { usersRepo } from '../../repos/users'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...TABLET_ROLES)
  await usersRepo.setPin(useDb(), actor.workshopId, actor.id, null)
  return { hasPin: false } satisfies PinStateDto
})

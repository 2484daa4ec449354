// Whether the signed-in caster or finisher has a tablet PIN (never the PIN or its hash).
import type { PinStateDto } from '#shared/types/tablets'
import { usersRepo } from '../../repos/users'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...TABLET_ROLES)
  return { hasPin: (await usersRepo.pinHash(useDb(), actor.workshopId, actor.id)) !== null } satisfies PinStateDto
})

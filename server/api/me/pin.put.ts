// Sets or changes my tablet PIN (caster, finisher), confirmed with my password: 4-8 digits,
// not an easy one (shared/utils/tablet-schemas.ts). A wrong password counts as a failed sign-in.
import type { PinStateDto } from '#shared/types/tablets'
import { setOwnPin } from '../../services/tablets'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...TABLET_ROLES)
  const { pin, password } = await validBody(event, tabletPinSetSchema)
  await setOwnPin(event, actor, pin, password)
  return { hasPin: true } satisfies PinStateDto
})

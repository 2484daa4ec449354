import type { TabletSwitchedDto } from '#shared/types/tablets'
// Switches the shared tablet to a person with their PIN (device cookie, no session needed):
// a normal session of that person, marked as on this tablet, replaces whatever session was
// there. Wrong PINs are limited per device and per person (server/services/tablets.ts).
import { checkTabletPin } from '../../services/tablets'

export default defineEventHandler(async (event) => {
  const tablet = await requireTablet(event)
  const { userId, pin } = await validBody(event, tabletSwitchSchema)
  const user = await checkTabletPin(event, tablet, userId, pin)
  await startSession(event, user, { id: tablet.id, name: tablet.name })
  // in use: the device cookie starts its year again
  setTabletCookie(event, getCookie(event, TABLET_COOKIE)!)
  return { id: user.id, name: user.name, role: user.role, home: ROLE_HOME[user.role] } satisfies TabletSwitchedDto
})

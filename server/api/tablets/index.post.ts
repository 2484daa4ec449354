import type { TabletRegisteredDto } from '#shared/types/tablets'
// "Use this device as a shared tablet" (lead, on the device itself): records the tablet, sets
// the long-lived device cookie (a random token; only its hash is kept) and ends the lead's own
// session here, so the device shows the person picker rather than the lead's pages.
import { registerTablet } from '../../services/tablets'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { name } = await validBody(event, tabletDeviceSchema)
  const { row, token } = await registerTablet(actor, name, getCookie(event, TABLET_COOKIE))
  setTabletCookie(event, token)
  await endSession(event)
  setResponseStatus(event, 201)
  return { id: row.id, name: row.name, next: '/tablet' } satisfies TabletRegisteredDto
})

// The workshop's shared tablets, live and revoked (lead); `current` marks the device asking.
import { tabletsRepo } from '../../repos/tablets'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const here = await liveTablet(getCookie(event, TABLET_COOKIE))
  const rows = await tabletsRepo.list(useDb(), actor.workshopId)
  return rows.map(r => ({ ...r, current: r.id === here?.id }))
})

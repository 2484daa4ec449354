// The workshop's shared tablets, live and revoked (lead); `current` marks the device asking.
import { listTablets } from '../../services/tablets'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const here = await liveTablet(getCookie(event, TABLET_COOKIE))
  return listTablets(actor, here?.id)
})

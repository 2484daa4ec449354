// Revokes a shared tablet (lead): it can no longer switch, and whoever is on it is signed out.
// Revoking one already revoked answers its row again.
import { tabletsRepo } from '../../../repos/tablets'
import { revokeTablet, revokedDto } from '../../../services/tablets'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const row = await revokeTablet(actor, id)
  // a lead revoking the very device they hold: it forgets the tablet too
  const token = getCookie(event, TABLET_COOKIE)
  if (token && (await tabletsRepo.byTokenHash(useDb(), hashLinkToken(token)))?.id === row.id) clearTabletCookie(event)
  return revokedDto(row)
})

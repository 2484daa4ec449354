import { revokeFeed } from '../../services/calendar-feeds'
// Revokes a feed link: from now on it answers 404.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  return revokeFeed(actor, id)
})

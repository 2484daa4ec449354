import { listFeeds } from '../../services/calendar-feeds'
// The workshop's calendar feed links (never their secrets), newest first.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  return listFeeds(actor)
})

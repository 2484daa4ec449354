import { feedIcs } from '../../services/calendar-feeds'
// A calendar feed (text/calendar) for a phone's calendar: no session, the secret in the link is
// the key (services/calendar-feeds.ts); a revoked or unknown link is a 404.
export default defineEventHandler(async (event) => {
  const { token } = validParams(event, deliveryFeedTokenSchema)
  const ics = await feedIcs(token)
  setResponseHeaders(event, { 'content-type': 'text/calendar; charset=utf-8', 'cache-control': 'private, no-store' })
  return ics
})

import { createFeed } from '../../services/calendar-feeds'
// A new secret calendar feed link, of the workshop or of one job; its address is shown once.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const input = await validBody(event, deliveryFeedCreateSchema)
  setResponseStatus(event, 201)
  return createFeed(actor, input.jobId ?? null)
})

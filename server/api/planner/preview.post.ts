// What the planner would put on the board for a range of days (lead); nothing is written.
import { previewPlan } from '../../services/planning'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const range = await validBody(event, boardRangeSchema)
  return previewPlan(actor, range)
})

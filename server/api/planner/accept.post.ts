// Writes the planner's proposal the lead accepted (lead): all of it or, on any refusal, none.
import { acceptPlan } from '../../services/planning'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const input = await validBody(event, plannerAcceptSchema)
  setResponseStatus(event, 201)
  return acceptPlan(actor, { from: input.from, to: input.to }, input.pours)
})

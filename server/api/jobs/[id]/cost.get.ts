// A job's actual cost against its estimate (lead only: costs and margins are the office's
// business; a client's routes and sockets carry none of it). Another workshop's job is a 404.
import { jobCostView } from '../../../queries/job-cost'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const cost = await jobCostView(useDb(), actor.workshopId, id)
  if (!cost) notFound('Job')
  return cost
})

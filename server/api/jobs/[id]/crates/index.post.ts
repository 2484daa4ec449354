import { createCrate } from '../../../../services/deliveries'
// A new crate for the job, with the pieces given packed into it (services/deliveries.ts).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead', 'finisher')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, deliveryCrateCreateSchema)
  setResponseStatus(event, 201)
  return createCrate(actor, id, input.pieceIds ?? [])
})

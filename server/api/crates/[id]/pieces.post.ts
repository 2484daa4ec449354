import { packCrate } from '../../../services/deliveries'
// More pieces packed into a crate; over the workshop's heaviest crate the answer says so.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead', 'finisher')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, deliveryCratePackSchema)
  return packCrate(actor, id, input)
})

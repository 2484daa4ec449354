import { voidPour } from '../../../services/pours'
// Voids a planned pour (lead) with a reason; the mould's slot is free again.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, pourIdParamsSchema)
  const input = await validBody(event, pourVoidSchema)
  return voidPour(actor, id, input)
})

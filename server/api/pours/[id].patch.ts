import { movePour } from '../../services/pours'
// Moves or re-plans a planned pour (lead), naming the version it saw.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, pourIdParamsSchema)
  const input = await validBody(event, pourMoveSchema)
  return movePour(actor, id, input)
})

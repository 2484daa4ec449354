import { pourAction } from '../../../services/floor-actions'
// One floor step of a pour (caster or lead), exactly once per actionId: a replay answers
// the first result (or the first refusal) again and changes nothing.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'caster', 'lead')
  const { id } = validParams(event, pourIdParamsSchema)
  const input = await validBody(event, floorActionSchema)
  const answer = await pourAction(actor, id, input)
  if (answer.replayed) setResponseHeader(event, 'x-setline-replayed', '1')
  return answer.result
})

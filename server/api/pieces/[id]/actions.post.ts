import { pieceAction } from '../../../services/finishing-actions'
// One finishing step of a piece (finisher or lead), exactly once per actionId: a replay answers
// the first result (or the first refusal) again and changes nothing.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'finisher', 'lead')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, finishingActionSchema)
  const answer = await pieceAction(actor, id, input)
  if (answer.replayed) setResponseHeader(event, 'x-setline-replayed', '1')
  return answer.result
})

import { createDispatch } from '../../../../services/dispatches'
// A dispatch note for some of the job's packed pieces (lead only: see services/dispatches.ts),
// exactly once per actionId so a double tap makes one note.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const input = await validBody(event, finishingDispatchSchema)
  const answer = await createDispatch(actor, id, input)
  if (answer.replayed) setResponseHeader(event, 'x-setline-replayed', '1')
  setResponseStatus(event, 201)
  return answer.result
})

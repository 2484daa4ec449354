// The pour board for a range of local days (staff): the workshop's calendar, benches, moulds,
// the non-void pours overlapping the range, shop days, open job items and casters.
import { boardData } from '../../queries/board'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  const { from, to } = validQuery(event, boardRangeSchema)
  return boardData(actor.workshopId, from, to)
})

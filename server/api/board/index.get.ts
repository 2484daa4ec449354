// The pour board for a range of local days (staff): the workshop's calendar, benches, moulds,
// the non-void pours overlapping the range, shop days, open job items and casters.
import type { BoardData } from '#shared/types/board'
import { boardJson } from '../../queries/board'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  const { from, to } = validQuery(event, boardRangeSchema)
  return jsonText<BoardData>(event, await boardJson(actor.workshopId, from, to))
})

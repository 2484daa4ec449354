// The day sheet (lead, caster): the day's pours by bench and the plaster requisition.
import { daySheet } from '../../queries/day-sheet'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead', 'caster')
  const { day } = validQuery(event, daySheetQuerySchema)
  return daySheet(actor.workshopId, day)
})

import { exportKind } from '../../../services/imports'
// A kind's CSV export with the very columns its import reads back (lead): grades, benches,
// clients with contacts, sites, open jobs with their items; figures in the workshop's units.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { kind } = validParams(event, exportKindParamSchema)
  const { rows, columns } = await exportKind(actor.workshopId, kind)
  return sendCsvRows(event, `setline-${kind}.csv`, rows, columns)
})

// The lead's quality figures over a period of local days: defect rates by mould, grade, caster
// and shop-temperature band, and predicted against actual demould minutes per grade.
import { qualityReport } from '../queries/quality'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { from, to } = validQuery(event, qualityQuerySchema)
  return qualityReport(actor.workshopId, from, to)
})

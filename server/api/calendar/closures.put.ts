import { replaceClosures } from '../../services/calendars'
// The shop's closures, the whole list at once (lead): no pour is planned on a closed day.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { closures } = await validBody(event, closuresPutSchema)
  return replaceClosures(actor, closures)
})

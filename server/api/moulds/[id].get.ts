import { mouldDetail } from '../../services/catalogue'
// One mould with its pours and state history (staff read).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  const { id } = validParams(event, idParamSchema)
  return mouldDetail(actor.workshopId, id)
})

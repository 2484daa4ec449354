import { listMoulds } from '../../services/catalogue'
// Moulds with bench, state and the life warning (staff read).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  return listMoulds(actor.workshopId)
})

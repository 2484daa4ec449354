import { listBenches } from '../../services/catalogue'
// Benches in board order (staff read).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, ...STAFF)
  return listBenches(actor.workshopId)
})

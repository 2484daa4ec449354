import { listClients } from '../../services/clients'
// The workshop's client organisations with their counts (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  return listClients(actor)
})

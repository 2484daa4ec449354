import { clientDetail } from '../../services/clients'
// One client organisation with its contacts, sites, portal members and jobs (lead).
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  return clientDetail(actor, id)
})

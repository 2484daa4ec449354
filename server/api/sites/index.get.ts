import { listSites } from '../../services/clients'
// Every client site of the workshop (lead): the job form's choice of site.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  return listSites(actor)
})

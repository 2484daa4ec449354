// A job's casting register, one page at a time (lead): every pour with its piece, filtered by
// local days (from, to), result, mould and caster. Also the moulds and casters to filter by.
import { registerPage } from '../../../queries/register'

export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  const { page, pageSize, ...filter } = validQuery(event, registerQuerySchema)
  return registerPage(actor.workshopId, id, filter, page, pageSize)
})

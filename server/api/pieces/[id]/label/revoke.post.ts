import { revokeLabel } from '../../../../services/piece-labels'
// Revokes a piece's printed label (lead): a scan of it opens nothing and says so.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead')
  const { id } = validParams(event, idParamSchema)
  return revokeLabel(actor, id)
})

import { scanLabel } from '../../services/piece-labels'
// A scanned label: the piece it names and its next finishing steps; 404 in words for another
// workshop's label, one never issued, or a revoked one.
export default defineEventHandler(async (event) => {
  const actor = await requireRole(event, 'lead', 'caster', 'finisher')
  const { token } = validParams(event, labelTokenParamSchema)
  return scanLabel(actor, token)
})
